/**
 * Fetchers of the "Report a defect" form: vehicles by VIN, fleet number or registration as the person types,
 * the chosen vehicle's defects (for the door picker's counts and the door's history), and the report itself.
 */
import { keepPreviousData, useMutation, useQuery } from '@tanstack/react-query';
import { apiFetch, toQuery } from '@/lib/client/api-client';
import type { ListResponse } from '@/lib/contracts/lists';
import type { DefectRecord } from '@/lib/contracts/defects';

/** A vehicle as the picker shows it. */
export type VehicleOption = {
  vin: string;
  fleetNumber: string | null;
  registration: string | null;
  make: string | null;
  model: string | null;
  depotCode: string;
  status: string;
  /** Build month, YYYY-MM: a defect cannot be reported before it. */
  buildMonth: string;
};

/** One earlier defect of the chosen vehicle. */
export type EarlierDefect = {
  id: number;
  ref: string;
  position: string;
  moduleCode: string;
  moduleFunction: string;
  status: string;
  open: boolean;
  reportedAt: string;
  closedAt: string | null;
  symptom: string | null;
};

/** Vehicles matching the typed text (two characters or more). */
export function useVehicleSearch(q: string) {
  const text = q.trim();
  return useQuery({
    queryKey: ['vehicles', 'typeahead', text],
    queryFn: () => apiFetch<ListResponse<VehicleOption>>(`/api/vehicles${toQuery({ q: text, pageSize: 8, sort: 'fleetNumber' })}`),
    enabled: text.length >= 2,
    placeholderData: keepPreviousData,
  });
}

/** The chosen vehicle's defects, newest first (at most 200). */
export function useVehicleDefects(vin: string | null) {
  return useQuery({
    queryKey: ['defects', 'vehicle', vin],
    queryFn: () => apiFetch<ListResponse<EarlierDefect>>(`/api/defects${toQuery({ vin, pageSize: 200, sort: '-reportedAt' })}`),
    enabled: !!vin,
  });
}

/** Send the report. */
export function useReportDefect() {
  return useMutation({
    mutationFn: (body: Record<string, unknown>) => apiFetch<DefectRecord>('/api/defects', { method: 'POST', json: body }),
  });
}
