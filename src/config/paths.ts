/** Every route of the client, named once; links and the router both read these. */
export const paths = {
  home: { path: '/', label: 'Floor' },
} as const;
