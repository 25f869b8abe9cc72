/** Background work queues (pg-boss on the app's own Postgres). Names only: safe anywhere. */
export const QUEUES = {
  nestingRun: "nesting-run",
  lowStockAlert: "low-stock-alert",
} as const;

export type QueueName = (typeof QUEUES)[keyof typeof QUEUES];
