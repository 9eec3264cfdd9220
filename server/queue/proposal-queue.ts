// Proposals wait in their own pg-boss queue on the run queue's connection, so the run workers
// take both (server/worker.ts) and a proposal's budget and retry rules match a run's.
import type PgBoss from 'pg-boss';
import type { Config } from '../config';

export const PROPOSAL_QUEUE = 'proposals';
export type ProposalJob = { proposalId: string };
export type ProposalEnqueuer = { enqueue: (proposalId: string) => Promise<void> };

export async function startProposalQueue(boss: PgBoss, config: Pick<Config, 'RUN_TIME_BUDGET_SECONDS' | 'RUN_EXPIRY_SLACK_SECONDS'>) {
  for (let attempt = 1; ; attempt++) {
    try {
      await boss.createQueue(PROPOSAL_QUEUE);
      break;
    } catch (e) {
      // Processes starting together on a new database may deadlock creating it (as for runs).
      if ((e as { code?: string }).code !== '40P01' || attempt >= 5) throw e;
      await new Promise((r) => setTimeout(r, 50 * attempt));
    }
  }
  return {
    async enqueue(proposalId: string): Promise<void> {
      const id = await boss.send(PROPOSAL_QUEUE, { proposalId } satisfies ProposalJob, {
        singletonKey: proposalId,
        retryLimit: 5,
        retryDelay: 1,
        expireInSeconds: Math.ceil(config.RUN_TIME_BUDGET_SECONDS + config.RUN_EXPIRY_SLACK_SECONDS),
      });
      if (id === null) throw new Error(`proposal ${proposalId} could not be queued`);
    },
    async work(concurrency: number, handler: (job: ProposalJob) => Promise<void>): Promise<void> {
      for (let i = 0; i < concurrency; i++) {
        await boss.work<ProposalJob>(PROPOSAL_QUEUE, { batchSize: 1, pollingIntervalSeconds: 0.5 }, async ([job]) => {
          if (job) await handler(job.data);
        });
      }
    },
    async stopTaking(): Promise<void> {
      await boss.offWork(PROPOSAL_QUEUE);
    },
  };
}
export type ProposalQueue = Awaited<ReturnType<typeof startProposalQueue>>;
