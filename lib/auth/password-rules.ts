/**
 * The password rule: 10 to 72 bytes (bcrypt reads only the first 72 bytes, so anything past them
 * would be silently ignored), and not guessable by the first tries of any password-guessing list.
 * Pure, shared by the schemas (lib/schemas/user.ts) and the forms' messages.
 */

export const PASSWORD_MIN_CHARS = 10;
export const PASSWORD_MAX_BYTES = 72;

// Words at the top of every published list of leaked passwords; a password that is one of them
// with digits or symbols around it is among an attacker's first guesses (common practice; the
// list is from memory of those lists, not copied from one).
const COMMON_WORDS = new Set([
  'password', 'passwort', 'passw', 'qwerty', 'qwertz', 'azerty', 'qwertyuiop', 'asdfghjkl', 'zxcvbnm', 'iloveyou', 'letmein', 'welcome',
  'admin', 'administrator', 'login', 'monkey', 'dragon', 'football', 'baseball', 'soccer', 'hockey', 'sunshine', 'princess', 'shadow',
  'superman', 'batman', 'master', 'michael', 'jennifer', 'jordan', 'hunter', 'trustno', 'whatever', 'starwars', 'freedom', 'secret',
  'changeme', 'default', 'abc', 'abcd', 'abcdef', 'abcdefg', 'abcdefgh', 'test', 'tester', 'testing', 'guest', 'user', 'root', 'access',
  'hello', 'charlie', 'donald', 'computer', 'internet', 'samsung', 'google', 'liverpool', 'chelsea', 'arsenal', 'pokemon', 'naruto',
  'killer', 'pepper', 'ginger', 'summer', 'winter', 'spring', 'autumn', 'flower', 'lovely', 'loveme', 'mustang', 'ferrari', 'cheese',
  'matrix', 'orange', 'banana', 'purple', 'silver', 'golden', 'nothing', 'zaq', 'zaqxsw', 'qazwsx', 'qweasd', 'asdasd', 'asdfasdf',
  'veilmeter', 'kestrel',
]);

// Keyboard rows and the alphabet, forwards; a password that is one straight run along one of them
// (either way) is a pattern, not a secret.
const RUNS = ['0123456789', '1234567890', 'abcdefghijklmnopqrstuvwxyz', 'qwertyuiop', 'asdfghjkl', 'zxcvbnm', '1qaz2wsx3edc4rfv5tgb', 'qazwsxedcrfvtgbyhn'];

const LEET: Record<string, string> = { '0': 'o', '1': 'i', '3': 'e', '4': 'a', '5': 's', '7': 't', '@': 'a', $: 's', '!': 'i' };

function isRun(s: string): boolean {
  if (s.length < 4) return false;
  return RUNS.some((r) => r.includes(s) || [...r].reverse().join('').includes(s) || (r + r).includes(s));
}

/** The password's problems as messages a person can act on (empty: the password is fine). */
export function passwordProblems(password: string, context: { email?: string; name?: string } = {}): string[] {
  const out: string[] = [];
  const chars = [...password].length;
  if (chars < PASSWORD_MIN_CHARS) out.push(`Use at least ${PASSWORD_MIN_CHARS} characters`);
  if (Buffer.byteLength(password, 'utf8') > PASSWORD_MAX_BYTES) out.push(`Use at most ${PASSWORD_MAX_BYTES} bytes (72 plain letters, fewer with accents or emoji): the rest would be ignored`);
  if (out.length) return out;

  const lower = password.toLowerCase();
  if (/^(.)\1*$/su.test(lower)) return ['Use more than one character over and over'];
  // one short piece over and over: abcabcabcabc, 12121212121
  if (/^(.{1,5})\1+$/su.test(lower)) return ['Use more than one short piece repeated'];
  if (isRun(lower)) return ['A straight run along the keyboard or the alphabet is among the first guesses'];

  // the word at the heart of it, with digits and symbols trimmed from both ends and look-alikes read as letters
  const core = lower.replace(/^[\d\W_]+|[\d\W_]+$/gu, '');
  const unleet = [...core].map((c) => LEET[c] ?? c).join('');
  if (COMMON_WORDS.has(core) || COMMON_WORDS.has(unleet) || (core === '' && isRun(lower.replace(/\D/g, '')))) {
    return ['This password is on every list of common passwords: choose another'];
  }
  // nothing but a common word repeated, or followed by a run of digits
  if ([...COMMON_WORDS].some((w) => w.length >= 4 && (unleet === w.repeat(Math.round(unleet.length / w.length)) || unleet.startsWith(w) && /^[\d\W_]*$/u.test(unleet.slice(w.length))))) {
    return ['This password is on every list of common passwords: choose another'];
  }

  const email = context.email?.trim().toLowerCase() ?? '';
  const local = email.split('@')[0] ?? '';
  if (email && (lower.includes(email) || (local.length >= 4 && (core === local || lower.includes(local) && core.length <= local.length + 2)))) {
    return ['Do not use your e-mail address in the password'];
  }
  const name = context.name?.trim().toLowerCase().replace(/\s+/g, '') ?? '';
  if (name.length >= 4 && core.replace(/\s+/g, '') === name) return ['Do not use your name as the password'];
  return [];
}
