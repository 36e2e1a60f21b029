/**
 * Find the vehicle by VIN, fleet number or registration: a combobox that searches as the person types
 * (GET /api/vehicles?q=, the caller's depots only), with arrow keys, Enter and Escape as usual.
 */
import { useEffect, useId, useState } from 'react';
import { useVehicleSearch, type VehicleOption } from './queries';
import { INPUT } from '@/components/defect-fields/CountedField';

type Props = {
  value: VehicleOption | null;
  onChange: (v: VehicleOption | null) => void;
  inputId: string;
  error?: string;
};

const describe = (v: VehicleOption) => [v.registration, [v.make, v.model].filter(Boolean).join(' '), `depot ${v.depotCode}`].filter(Boolean).join(' · ');

/** The vehicle picker. */
export function VehiclePicker({ value, onChange, inputId, error }: Props) {
  const listId = useId();
  const [text, setText] = useState('');
  const [debounced, setDebounced] = useState('');
  const [open, setOpen] = useState(false);
  const [active, setActive] = useState(0);
  useEffect(() => {
    const t = setTimeout(() => setDebounced(text), 200);
    return () => clearTimeout(t);
  }, [text]);
  const search = useVehicleSearch(debounced);
  const items = debounced.trim().length >= 2 ? (search.data?.items ?? []) : [];

  if (value) {
    return (
      <div className="flex flex-wrap items-center justify-between gap-3 rounded-md border border-estuary-300 bg-estuary-50 px-3 py-2" data-testid="chosen-vehicle">
        <div className="min-w-0">
          <div className="font-semibold text-ink-900">
            {value.fleetNumber ?? 'Vehicle'} <span className="mono text-sm font-normal text-ink-600">{value.vin}</span>
          </div>
          <div className="text-sm text-ink-600">{describe(value)}</div>
          {value.status === 'retired' && <div className="text-sm font-semibold text-amber-800">This vehicle is retired.</div>}
        </div>
        <button
          type="button"
          className="btn-secondary"
          onClick={() => {
            onChange(null);
            setText('');
            setTimeout(() => document.getElementById(inputId)?.focus(), 0);
          }}
        >
          Change vehicle
        </button>
      </div>
    );
  }

  const choose = (v: VehicleOption) => {
    onChange(v);
    setOpen(false);
  };
  return (
    <div className="relative">
      <input
        id={inputId}
        className={INPUT}
        role="combobox"
        aria-expanded={open && items.length > 0}
        aria-controls={listId}
        aria-autocomplete="list"
        aria-activedescendant={open && items[active] ? `${listId}-${active}` : undefined}
        aria-invalid={error ? true : undefined}
        aria-describedby={error ? `${inputId}-error` : `${inputId}-hint`}
        autoComplete="off"
        placeholder="VIN, fleet number or registration"
        value={text}
        onChange={(e) => {
          setText(e.target.value);
          setOpen(true);
          setActive(0);
        }}
        onFocus={() => setOpen(true)}
        onBlur={() => setTimeout(() => setOpen(false), 150)}
        onKeyDown={(e) => {
          if (e.key === 'ArrowDown') {
            e.preventDefault();
            setOpen(true);
            setActive((a) => Math.min(a + 1, items.length - 1));
          } else if (e.key === 'ArrowUp') {
            e.preventDefault();
            setActive((a) => Math.max(a - 1, 0));
          } else if (e.key === 'Enter' && open && items[active]) {
            e.preventDefault();
            choose(items[active]);
          } else if (e.key === 'Escape') setOpen(false);
        }}
      />
      {open && items.length > 0 && (
        <ul id={listId} role="listbox" aria-label="Matching vehicles" className="absolute z-20 mt-1 max-h-80 w-full overflow-y-auto rounded-md border border-ink-200 bg-white py-1 shadow-lg">
          {items.map((v, i) => (
            <li
              key={v.vin}
              id={`${listId}-${i}`}
              role="option"
              aria-selected={i === active}
              className={`cursor-pointer px-3 py-2 ${i === active ? 'bg-estuary-50' : ''}`}
              onMouseDown={(e) => {
                e.preventDefault();
                choose(v);
              }}
              onMouseEnter={() => setActive(i)}
            >
              <div className="font-semibold text-ink-900">
                {v.fleetNumber ?? v.vin} <span className="mono text-xs font-normal text-ink-500">{v.vin}</span>
              </div>
              <div className="text-xs text-ink-600">{describe(v)}</div>
            </li>
          ))}
        </ul>
      )}
      {open && debounced.trim().length >= 2 && !search.isFetching && items.length === 0 && (
        <p className="mt-1 text-sm text-ink-600" role="status">
          No vehicle in your depots matches “{debounced.trim()}”.
        </p>
      )}
    </div>
  );
}
