/**
 * Choose a door on a plan view of the vehicle (front at the top), as a radio group of large tiles: quicker
 * and surer on a workshop tablet than a list. Arrow keys move between doors, as in any radio group.
 */
import { useRef, type KeyboardEvent } from 'react';
import { POSITION_LABELS } from '@/components/labels';
import { DOOR_ORDER } from '@/lib/defects/doors';

const DOORS = DOOR_ORDER;
const PLACE: Record<string, string> = {
  FL: 'col-start-1 row-start-1',
  FR: 'col-start-3 row-start-1',
  SL: 'col-start-1 row-start-2',
  SR: 'col-start-3 row-start-2',
  RL: 'col-start-1 row-start-3',
  RR: 'col-start-3 row-start-3',
  TG: 'col-start-2 row-start-4',
};

type Props = {
  value: string;
  onChange: (position: string) => void;
  /** Id of the visible label (the group's name). */
  labelledBy: string;
  /** Defects already recorded per door, shown as a small count. */
  counts?: Record<string, { total: number; open: number }>;
  invalid?: boolean;
  describedBy?: string;
};

/** The door picker. */
export function DoorPicker({ value, onChange, labelledBy, counts, invalid, describedBy }: Props) {
  const refs = useRef<Record<string, HTMLButtonElement | null>>({});
  const move = (e: KeyboardEvent, from: string) => {
    const i = DOORS.indexOf(from as (typeof DOORS)[number]);
    const d = e.key === 'ArrowRight' || e.key === 'ArrowDown' ? 1 : e.key === 'ArrowLeft' || e.key === 'ArrowUp' ? -1 : 0;
    if (!d) return;
    e.preventDefault();
    const next = DOORS[(i + d + DOORS.length) % DOORS.length]!;
    onChange(next);
    refs.current[next]?.focus();
  };
  const focusable = value || 'FL';
  return (
    <div
      role="radiogroup"
      aria-labelledby={labelledBy}
      aria-invalid={invalid || undefined}
      aria-describedby={describedBy}
      className="grid max-w-md grid-cols-[1fr_4.5rem_1fr] grid-rows-[repeat(4,auto)] gap-1.5"
    >
      <div
        className="col-start-2 row-span-3 row-start-1 flex flex-col items-center justify-between rounded-t-[2.5rem] rounded-b-lg border-2 border-ink-300 bg-ink-50 py-3 text-xs font-semibold tracking-wide text-ink-500 uppercase"
        aria-hidden="true"
      >
        <span>Front</span>
        <svg width="18" height="18" viewBox="0 0 24 24" fill="none" stroke="currentColor" strokeWidth="2">
          <path d="M12 19V5M6 11l6-6 6 6" />
        </svg>
        <span>Rear</span>
      </div>
      {DOORS.map((p) => {
        const on = value === p;
        const c = counts?.[p];
        return (
          <button
            key={p}
            ref={(el) => {
              refs.current[p] = el;
            }}
            type="button"
            role="radio"
            aria-checked={on}
            aria-label={`${POSITION_LABELS[p]} (${p})${c?.total ? `, ${c.total} earlier defect${c.total === 1 ? '' : 's'}` : ''}`}
            tabIndex={p === focusable ? 0 : -1}
            onClick={() => onChange(p)}
            onKeyDown={(e) => move(e, p)}
            className={[
              PLACE[p],
              'flex min-h-14 flex-col items-start justify-center rounded-md border px-2.5 py-1.5 text-left text-sm transition-colors',
              on
                ? 'border-estuary-700 bg-estuary-700 text-white'
                : `${invalid && !value ? 'border-brick-600' : 'border-ink-300'} bg-white text-ink-800 hover:border-estuary-500 hover:bg-estuary-50`,
            ].join(' ')}
          >
            <span className="flex w-full items-baseline justify-between gap-2">
              <span className="font-bold">{p}</span>
              {c && c.total > 0 && (
                <span className={`text-xs font-semibold ${on ? 'text-estuary-100' : c.open ? 'text-amber-800' : 'text-ink-500'}`}>
                  {c.total} earlier{c.open ? `, ${c.open} open` : ''}
                </span>
              )}
            </span>
            <span className={`text-xs leading-tight ${on ? 'text-estuary-100' : 'text-ink-500'}`}>{POSITION_LABELS[p]}</span>
          </button>
        );
      })}
    </div>
  );
}
