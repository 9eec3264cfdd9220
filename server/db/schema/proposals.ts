// Proposals: searches for the best change (contraflow, closures that hurt most, added lanes,
// the quickest departure order, zone routes), each with the exact input it used and its answer.
// Their own table and queue, beside runs: a proposal's answer is a change, which the planner
// saves as a scenario and then runs and compares like any other.
import { index, jsonb, pgTable, real, text, timestamp, uuid } from 'drizzle-orm/pg-core';
import type { ProposalKind, ProposalResult } from '../../../shared/api/proposals';
import type { ProposalInput } from '../../optimization/proposal-input';
import { plans } from './plans';
import { users } from './organizations';
import { runStatusEnum } from './runs';

export const proposals = pgTable(
  'proposals',
  {
    id: uuid().primaryKey().defaultRandom(),
    planId: uuid()
      .notNull()
      .references(() => plans.id, { onDelete: 'cascade' }),
    scenarioId: uuid(),
    kind: text().$type<ProposalKind>().notNull(),
    status: runStatusEnum().notNull().default('queued'),
    phase: text().notNull().default('queued'),
    progress: real().notNull().default(0),
    input: jsonb().$type<ProposalInput>().notNull(),
    inputHash: text().notNull(),
    result: jsonb().$type<ProposalResult>(),
    failureReason: text(),
    savedScenarioId: uuid(),
    createdBy: uuid().references(() => users.id, { onDelete: 'set null' }),
    createdAt: timestamp({ withTimezone: true, mode: 'date' }).notNull().defaultNow(),
    startedAt: timestamp({ withTimezone: true, mode: 'date' }),
    finishedAt: timestamp({ withTimezone: true, mode: 'date' }),
  },
  (t) => [index().on(t.planId, t.createdAt)],
);
