import { Badge } from '../../../components/ui/notice';
import type { OilAnalysisRow } from '../../../../shared/schemas/oil-analysis';

/** Red when a result calls for action (condition work raised), yellow for a caution to watch, green when all is within. */
export function OilVerdict({ row }: { row: OilAnalysisRow }) {
  if (row.outOfLimits) return <Badge tone="danger">Action</Badge>;
  if (row.findings.some((f) => f.severity === 'caution')) return <Badge tone="caution">Caution: watch</Badge>;
  if (!row.targetCode) return <Badge>No targets set</Badge>;
  return <Badge tone="safe">Within targets</Badge>;
}
