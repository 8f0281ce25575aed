/** The cookie that remembers which of a person's labs is active. */
export const LAB_COOKIE = 'vm-lab';
