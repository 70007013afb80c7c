import { PageTitle } from '../../components/layout/app-shell';
import { Panel } from '../../components/ui/notice';
import { CounterImport } from '../../features/meters/components/counter-import';

export function Component() {
  return (
    <>
      <PageTitle title="Import counter readings" subtitle="Bring in arc starts, hits and hours from a machine control's export or a spreadsheet, as CSV." />
      <Panel title="The layout">
        <div className="space-y-2 text-steel-800">
          <p>
            One reading per line, with a header line naming the columns <code>machine_code</code>, <code>meter_code</code>, <code>read_at</code>,{' '}
            <code>value</code> and, if you need them, <code>reset</code> (yes/no) and <code>unit</code>. Times like <code>2026-03-14T07:30:00Z</code> are taken
            as written; <code>2026-03-14 07:30</code> is the shop's local time. Decimals use a point and no thousands separators.
          </p>
          <p>
            Checking the file writes nothing. The import adds every reading or none; readings already recorded are skipped, so importing the same file twice is
            harmless.
          </p>
          <a
            className="inline-flex min-h-touch items-center rounded border border-steel-400 bg-white px-4 font-semibold underline"
            href="/api/counter-import/template"
            download
          >
            Download the template
          </a>
        </div>
      </Panel>
      <Panel title="Upload">
        <CounterImport />
      </Panel>
    </>
  );
}
