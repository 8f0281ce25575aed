/** What a bearer token may be allowed to do on the rig API (kept on the token, db/queries/api-tokens.ts). */
export const TOKEN_SCOPES = ['read', 'capture:write', 'capture:delete', 'export'] as const;
export type TokenScope = (typeof TOKEN_SCOPES)[number];

export const SCOPE_LABELS: Record<TokenScope, string> = {
  read: 'Read projects, capture sets, analyses and readings',
  'capture:write': 'Create capture sets, upload photos, set regions, apply templates, start analyses',
  'capture:delete': 'Delete capture sets this token created',
  export: 'Download the readings CSV',
};
