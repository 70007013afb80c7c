import { PageTitle } from '../../components/layout/app-shell';
import { Panel } from '../../components/ui/notice';
import { NotifyPreferenceForm } from '../../features/work-orders/components/notify-preference-form';
import { CalendarFeedPanel } from '../../features/calendar-feed/components/calendar-feed-panel';

export function Component() {
  return (
    <>
      <PageTitle title="My notices" subtitle="How Kerfbook tells you about your work: e-mail and a private calendar." />
      <div className="grid gap-4 lg:grid-cols-2">
        <Panel title="E-mail">
          <NotifyPreferenceForm />
        </Panel>
        <Panel title="Calendar">
          <CalendarFeedPanel />
        </Panel>
      </div>
    </>
  );
}
