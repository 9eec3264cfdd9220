// The words for a search that stopped at a limit: each limit named, with what to do about it.
import { describe, expect, it } from 'vitest';
import type { ProposalAnswer } from '../../../shared/api/proposals';
import { searchBudgetReason, searchLimits } from '../../../shared/format/search-limits';

const road = (clearanceTested: boolean) => ({
  segmentId: 1,
  direction: 'forward' as const,
  name: 'Mill Lane',
  roadClass: 'secondary',
  baseFlowVehiclesPerHour: 600,
  lossVehiclesPerHour: 600,
  clearanceMinutes: null,
  clearanceLossMinutes: null,
  deliveredLossVehicles: 0,
  stopsClearance: false,
  clearanceTested,
});

describe('search limits', () => {
  it('a quickest order that does not clear within the horizon says so and asks for a longer horizon or a coarser step', () => {
    const answer: ProposalAnswer = {
      kind: 'release-order',
      stepMinutes: 5,
      quickestClearanceMinutes: null,
      expectedClearanceMinutes: null,
      scheduleClearanceMinutes: null,
      waitsMovedHome: true,
      demandVehicles: 10,
      quickestDeliveredByStep: [0, 5],
      expectedDeliveredByStep: [0, 3],
      zones: [],
    };
    const [limit, ...rest] = searchLimits(answer, { horizonMinutes: 30 });
    expect(rest).toEqual([]);
    expect(limit!.kind).toBe('horizon');
    expect(limit!.message).toContain('within the horizon of 30 min');
    expect(limit!.message).toContain('longer horizon');
    expect(limit!.message).toContain('coarser time step');
    expect(searchLimits({ ...answer, quickestClearanceMinutes: 25 }, { horizonMinutes: 30 })).toEqual([]);
  });

  it('closures: roads left out, roads without a clearance time, and a plan that does not clear are each named', () => {
    const answer: ProposalAnswer = {
      kind: 'closures',
      closeAtMinutes: 0,
      baseVehiclesPerHour: 1200,
      baseClearanceMinutes: null,
      truncated: true,
      roads: [road(true), road(true), road(false)],
    };
    const limits = searchLimits(answer, { horizonMinutes: 360, maxRoads: 3 });
    expect(limits.map((l) => l.kind)).toEqual(['horizon', 'candidates', 'clearance-tests']);
    expect(limits[1]!.message).toMatch(/^Only the 3 roads carrying the most vehicles were tested/);
    expect(limits[1]!.message).toContain('raise the number of roads to test (at most 500)');
    expect(limits[2]!.message).toContain('computed for the 2 roads');
    expect(limits[2]!.message).toContain('the other 1 show the loss per hour only');
    expect(searchLimits({ ...answer, baseClearanceMinutes: 90, truncated: false, roads: [road(true)] }, { horizonMinutes: 360 })).toEqual([]);
  });

  it('a search stopped at its budget says which budget and what to change', () => {
    const reason = searchBudgetReason('time', { timeSeconds: 900, memoryMegabytes: 4096 });
    expect(reason).toMatch(/^The search took longer than its time budget of 900 s and was stopped\./);
    expect(reason).toContain('coarser time step');
    expect(reason).toContain('fewer roads');
    expect(searchBudgetReason('memory', { timeSeconds: 900, memoryMegabytes: 4096 })).toContain('memory budget of 4096 MB');
  });
});
