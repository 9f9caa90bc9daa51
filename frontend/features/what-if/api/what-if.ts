import { queryOptions, useMutation, useQuery, useQueryClient } from "@tanstack/react-query";
import {
  AllocationSchema,
  CreatedRunSchema,
  InclinationGridSchema,
  SweepSchema,
  type CreateAllocation,
  type CreateSweep,
} from "@shared/schemas/what-if";
import { RevisionSchema } from "@shared/schemas/revisions";
import { api, withQuery } from "@frontend/lib/api-client";

export const whatIfKeys = {
  all: ["what-if"] as const,
  sweep: (id: string) => [...whatIfKeys.all, "sweep", id] as const,
  allocation: (id: string) => [...whatIfKeys.all, "allocation", id] as const,
  grid: (date: string, stepDeg: number) => [...whatIfKeys.all, "inclination-grid", date, stepDeg] as const,
};

const ACTIVE = new Set(["queued", "running"]);
/** The queue writes progress about four times a second; once a second on screen is enough. */
const POLL_MS = 1000;
const poll = {
  staleTime: (q: { state: { data?: { status: string } } }) => (q.state.data && !ACTIVE.has(q.state.data.status) ? Infinity : 0),
  refetchInterval: (q: { state: { data?: { status: string } } }) => (q.state.data && ACTIVE.has(q.state.data.status) ? POLL_MS : false),
} as const;

const enc = encodeURIComponent;

export const sweepQueryOptions = (id: string) =>
  queryOptions({
    queryKey: whatIfKeys.sweep(id),
    queryFn: ({ signal }) => api.get(`/api/sweeps/${enc(id)}`, SweepSchema, signal),
    ...poll,
  });
export const allocationQueryOptions = (id: string) =>
  queryOptions({
    queryKey: whatIfKeys.allocation(id),
    queryFn: ({ signal }) => api.get(`/api/allocations/${enc(id)}`, AllocationSchema, signal),
    ...poll,
  });

export const useSweep = (id: string | null) => useQuery({ ...sweepQueryOptions(id ?? ""), enabled: !!id });
export const useAllocation = (id: string | null) => useQuery({ ...allocationQueryOptions(id ?? ""), enabled: !!id });

export function useCreateSweep() {
  return useMutation({
    mutationFn: ({ revisionId, body }: { revisionId: string; body: CreateSweep }) =>
      api.post(`/api/revisions/${enc(revisionId)}/sweeps`, body, CreatedRunSchema),
  });
}

export function useCreateAllocation() {
  return useMutation({
    mutationFn: ({ revisionId, body }: { revisionId: string; body: CreateAllocation }) =>
      api.post(`/api/revisions/${enc(revisionId)}/allocations`, body, CreatedRunSchema),
  });
}

/** Stops a queued or running sweep; the answer is the sweep as it stands, written into the cache. */
export function useCancelSweep() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (id: string) => api.post(`/api/sweeps/${enc(id)}/cancel`, {}, SweepSchema),
    onSuccess: (sweep) => queryClient.setQueryData(whatIfKeys.sweep(sweep.id), sweep),
  });
}

/** Stops a queued or running allocation. */
export function useCancelAllocation() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (id: string) => api.post(`/api/allocations/${enc(id)}/cancel`, {}, AllocationSchema),
    onSuccess: (allocation) => queryClient.setQueryData(whatIfKeys.allocation(allocation.id), allocation),
  });
}

export function useApplyAllocation() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (id: string) => api.post(`/api/allocations/${enc(id)}/apply`, {}, RevisionSchema),
    onSuccess: (_rev, id) => void queryClient.invalidateQueries({ queryKey: whatIfKeys.allocation(id) }),
  });
}

export function useInclinationGrid(date: string, stepDeg: number, enabled: boolean) {
  return useQuery({
    queryKey: whatIfKeys.grid(date, stepDeg),
    queryFn: ({ signal }) => api.get(withQuery("/api/inclination-grid", { date, stepDeg: String(stepDeg) }), InclinationGridSchema, signal),
    staleTime: Infinity,
    enabled,
  });
}
