/** The cookie that remembers a dismissed first-visit guide (read by the projects page, so it never flashes). */
export const GUIDE_COOKIE = 'vm-guide';
