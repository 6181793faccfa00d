/** The demo scenario's administrator: while this account exists, every page says the demo is present. */
export const DEMO_ADMIN_EMAIL = "admin@ringbatch.example";
