/**
 * The two charts of the printable evidence pack at a fixed width that fits an A4 page (680 px ≈ 180 mm), without
 * tooltips: failures by build month, and the group's mean cumulative function against the rest of its band.
 * Recharts draws only in the browser, so the page hydrates this island before it is printed.
 */
import type { McfResponse } from '@/lib/contracts/patterns';
import type { CohortMonth, ExposureBand } from '@/lib/patterns/types';
import { formatBuildRange } from '@/lib/patterns/records';
import { BAND_LABELS, COMPARE_COLOURS } from './labels';
import { McfChart } from './McfChart';
import { RateChart } from './RateChart';

/** Chart width on the printed page, in CSS pixels. */
export const EVIDENCE_CHART_WIDTH = 680;

type Props = {
  which: 'rate' | 'mcf';
  months?: CohortMonth[];
  buildFrom?: string;
  buildTo?: string;
  compare?: McfResponse['compare'];
  band?: ExposureBand;
};

/** One chart of the pack. */
export default function EvidenceCharts({ which, months = [], buildFrom = '', buildTo = '', compare, band = 'high' }: Props) {
  if (which === 'rate') return <RateChart months={months} buildFrom={buildFrom} buildTo={buildTo} width={EVIDENCE_CHART_WIDTH} height={270} static />;
  const curves = (compare?.series ?? []).map((s) => ({
    key: s.key,
    label: s.key === 'cohort' ? `This group (built ${formatBuildRange({ buildFrom, buildTo })})` : `Rest of the ${BAND_LABELS[band].toLowerCase()} exposure band`,
    colour: COMPARE_COLOURS[s.key],
    heavy: s.key === 'cohort',
    points: s.points,
  }));
  return <McfChart curves={curves} subject={`of this group against the rest of the ${BAND_LABELS[band].toLowerCase()} exposure band`} width={EVIDENCE_CHART_WIDTH} height={280} static />;
}
