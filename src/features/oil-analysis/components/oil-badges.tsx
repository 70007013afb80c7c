import { Badge } from '../../../components/ui/notice';
import type { OilAnalysisRow } from '../../../../shared/schemas/oil-analysis';

/** Red when a result is outside a target, yellow for drift inside the band, green when all is within. */
export function OilVerdict({ row }: { row: OilAnalysisRow }) {
  if (row.outOfLimits) return <Badge tone="danger">Outside targets</Badge>;
  if (row.findings.some((f) => f.severity === 'caution')) return <Badge tone="caution">Drifting</Badge>;
  if (!row.targetCode) return <Badge>No targets set</Badge>;
  return <Badge tone="safe">Within targets</Badge>;
}
