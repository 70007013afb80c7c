import type { WorkOrderDetail } from '../../../../shared/schemas/work-orders';
import { useShopFormat } from '../../../lib/format';

const words: Record<string, string> = {
  'work-order.raised': 'Raised',
  'work-order.start': 'Started',
  'work-order.pause': 'Paused',
  'work-order.resume': 'Resumed',
  'work-order.cancel': 'Called off',
  'work-order.checklist': 'Checklist saved',
  'work-order.part-used': 'Part taken from stock',
  'work-order.part-returned': 'Part returned to stock',
  'work-order.attachment': 'File attached',
  'work-order.updated': 'Details changed',
  'work-order.escalated': 'Past due: admin told',
  'work-order.closed': 'Signed off',
  'work-order.done-at-station': 'Done by a station record',
  'work-order.failed-check-repair': 'Repair raised for a failed safety check',
  'work-order.failed-check-deviation': 'Deviation signed for a failed safety check',
};

export function WorkHistory({ wo }: { wo: WorkOrderDetail }) {
  const f = useShopFormat();
  return (
    <ol className="space-y-1 text-sm">
      {wo.history.map((h, i) => (
        <li key={i} className="flex flex-wrap gap-x-2">
          <span className="text-steel-600">{f.dateTime(h.at)}</span>
          <span className="font-semibold">{words[h.action] ?? h.action}</span>
          <span>{h.who ?? 'Kerfbook schedule'}</span>
          {h.details && typeof h.details.reason === 'string' ? <span className="text-steel-700">— {h.details.reason}</span> : null}
        </li>
      ))}
    </ol>
  );
}
