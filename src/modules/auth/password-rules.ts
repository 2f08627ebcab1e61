/**
 * Password rules from NIST SP 800-63B (June 2017, updated March 2020), §5.1.1.2 "Memorized Secret Verifiers".
 * Length over composition: no "one digit, one capital" rules, a long passphrase is the best password.
 * Each finding's code names the clause it comes from.
 */
import type { Finding } from '../../common/errors/domain.exception';

/** §5.1.1.2 requires at least 8 characters for a secret chosen by the subscriber; 12 is this shop software's policy. */
export const MIN_LENGTH = 12;
/** §5.1.1.2: verifiers SHOULD permit at least 64 characters. 256 keeps the hashing cost bounded. */
export const MAX_LENGTH = 256;

/**
 * §5.1.1.2: compare against "passwords obtained from previous breach corpuses; dictionary words; repetitive or
 * sequential characters; context-specific words". A small list of values seen at the top of published
 * breach-frequency lists (from memory), only those long enough to pass the length rule.
 */
const COMMON = new Set([
  '123456789012', '1234567890123', '12345678901234', '123456789123', '111111111111', '000000000000', '123123123123',
  'password1234', 'password12345', 'password123!', 'passwordpassword', 'password1password', 'qwertyuiop12',
  'qwertyuiop123', 'qwerty123456', 'qwertyqwerty', '1q2w3e4r5t6y', '1qaz2wsx3edc', 'qazwsxedcrfv', 'zaq12wsxcde3',
  'iloveyou1234', 'letmein12345', 'welcome12345', 'welcome123456', 'admin1234567', 'administrator', 'changeme1234',
  'trustno1trustno1', 'abc123456789', 'abcdefghijkl', 'football1234', 'baseball1234', 'monkey123456', 'dragon123456',
  'sunshine1234', 'princess1234', 'superman1234', 'starwars1234', 'master123456', 'shadow123456', 'michael12345',
  'correcthorsebatterystaple', 'iloveyouiloveyou', 'asdfghjkl123', 'asdfasdfasdf', 'zxcvbnm12345', 'p@ssw0rd1234',
  'passw0rd1234', 'mustang12345', 'jennifer1234', 'whatever1234', 'computer1234', 'internet1234',
]);

export interface PasswordContext {
  email?: string;
  name?: string;
  shopName?: string;
}

/** NFKC, as §5.1.1.2 asks for Unicode secrets before hashing; the same form is hashed and checked. */
export function normalisePassword(password: string): string {
  return password.normalize('NFKC');
}

/** Words a guesser tries first for this account: the service, the shop, the person, the email's parts. */
function contextWords(context: PasswordContext): string[] {
  const words = ['tracebay', ...[context.email, context.name, context.shopName].flatMap((t) => (t ?? '').toLowerCase().split(/[^\p{L}\p{N}]+/u))];
  return [...new Set(words.filter((w) => w.length >= 4))];
}

/** One character repeated, or one run up or down the character table ("abcdefghijkl", "987654321098" excepted). */
function repetitiveOrSequential(p: string): boolean {
  const codes = [...p].map((c) => c.codePointAt(0)!);
  const steps = new Set(codes.slice(1).map((c, i) => c - codes[i]!));
  return steps.size === 1 && [0, 1, -1].includes([...steps][0]!);
}

/** Every rule the password breaks (empty when it is acceptable), each with the clause it comes from. */
export function checkPassword(password: string, context: PasswordContext = {}, path = 'password'): Finding[] {
  const p = normalisePassword(password);
  const length = [...p].length;
  const findings: Finding[] = [];
  if (length < MIN_LENGTH) {
    findings.push({ code: 'password.too_short', path, message: `A password has at least ${MIN_LENGTH} characters (shop policy; NIST SP 800-63B §5.1.1.2 asks for at least 8); this one has ${length}.` });
  }
  if (length > MAX_LENGTH) {
    findings.push({ code: 'password.too_long', path, message: `A password has at most ${MAX_LENGTH} characters (NIST SP 800-63B §5.1.1.2 asks to allow at least 64); this one has ${length}.` });
  }
  // §5.1.1.2: all printing characters and spaces are acceptable; control characters cannot be typed reliably.
  if (/\p{Cc}/u.test(p)) {
    findings.push({ code: 'password.control_character', path, message: 'A password may use any printable character or space, but no control characters (tab, new line…) (NIST SP 800-63B §5.1.1.2).' });
  }
  if (findings.length > 0) return findings;
  const lower = p.toLowerCase();
  if (COMMON.has(lower)) {
    findings.push({ code: 'password.commonly_used', path, message: 'This password is on the list of commonly used or breached passwords (NIST SP 800-63B §5.1.1.2): choose another, a few unrelated words work well.' });
  } else if (repetitiveOrSequential(lower)) {
    findings.push({ code: 'password.repetitive_or_sequential', path, message: 'A password made of one repeated or sequential run of characters is refused (NIST SP 800-63B §5.1.1.2).' });
  }
  const word = contextWords(context).find((w) => lower.includes(w));
  if (word) {
    findings.push({ code: 'password.context_word', path, message: `A password may not contain “${word}”: the service, shop, name or email of the account are guessed first (NIST SP 800-63B §5.1.1.2, context-specific words).` });
  }
  return findings;
}
