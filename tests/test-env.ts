/** Names and passwords of the throwaway test cluster's roles; nothing here guards real data. */
export const TEST_TEMPLATE_DB = 'halfmark_template';
export const TEST_ROLES = {
  owner: { name: 'halfmark_owner', password: 'test-owner-password' },
  app: { name: 'halfmark_app', password: 'test-app-password' },
};
export const TEST_SESSION_SECRET = 'test-session-secret-that-is-long-enough-0123456789';
