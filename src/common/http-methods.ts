/** The HTTP methods that change something: the ones idempotency keys and write budgets apply to. */
export const WRITE_METHODS: ReadonlySet<string> = new Set(['POST', 'PATCH', 'PUT', 'DELETE']);
