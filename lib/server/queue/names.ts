import { z } from 'zod';

export const ANALYSIS_QUEUE = 'analysis';

/** Job data carries ids only: never bytes or secrets. */
export const analysisJobSchema = z.object({ analysisId: z.string().uuid(), labId: z.string().uuid() });
export type AnalysisJob = z.infer<typeof analysisJobSchema>;

/** BullMQ job ids may not contain ':'; one id per analysis makes enqueueing idempotent. */
export const analysisJobId = (analysisId: string) => `analysis-${analysisId}`;
