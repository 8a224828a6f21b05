/** Every route of the client, named once; links and the router both read these. */
export const paths = {
  home: { path: '/', label: 'Floor' },
  signIn: { path: '/sign-in', label: 'Sign in' },
  forgotPassword: { path: '/forgot-password', label: 'Forgot password' },
  setPassword: { path: '/set-password', label: 'Set password' },
  account: { path: '/account', label: 'Account' },
  users: { path: '/users', label: 'People' },
  stations: { path: '/stations', label: 'Stations' },
  outbox: { path: '/outbox', label: 'Outbox' },
  labels: {
    path: '/labels',
    label: 'Labels',
    href: (kind: string, codes: readonly string[]) => `/labels?kind=${encodeURIComponent(kind)}&codes=${codes.map(encodeURIComponent).join(',')}`,
  },
} as const;
