/**
 * The two charts of the printable evidence pack at a fixed width that fits an A4 page (680 px ≈ 180 mm), without
 * tooltips. Recharts draws only in the browser, so the page hydrates this island before it is printed.
 */
import type { McfResponse } from '@/lib/contracts/patterns';
import type { CohortMonth, ExposureBand } from '@/lib/patterns/types';
import { McfChart } from './McfChart';
import { RateChart } from './RateChart';

/** Chart width on the printed page, in CSS pixels. */
export const EVIDENCE_CHART_WIDTH = 680;

type Props = {
  which: 'rate' | 'mcf';
  months?: CohortMonth[];
  buildFrom?: string;
  buildTo?: string;
  mcf?: McfResponse['series'];
  band?: ExposureBand;
};

/** One chart of the pack. */
export default function EvidenceCharts({ which, months = [], buildFrom = '', buildTo = '', mcf = [], band }: Props) {
  return which === 'rate' ? (
    <RateChart months={months} buildFrom={buildFrom} buildTo={buildTo} width={EVIDENCE_CHART_WIDTH} height={260} static />
  ) : (
    <McfChart series={mcf} highlight={band} width={EVIDENCE_CHART_WIDTH} height={280} static />
  );
}
