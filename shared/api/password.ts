// Password policy shared by the register/reset/change forms and the API (one home, same answer).
// Length first (NIST SP 800-63B §5.1.1.2: at least 8, we ask 10), then a check against a short
// list of the most common choices and trivial patterns (same section: "values known to be
// commonly-used, expected, or compromised"). The list is from memory of widely published
// common-password lists, not a copy of any one of them.

const COMMON = new Set([
  'password', 'passw0rd', 'passwort', 'motdepasse', 'contrasena', 'qwerty', 'qwertyuiop', 'asdfghjkl', 'azerty', 'zxcvbnm',
  'letmein', 'welcome', 'admin', 'administrator', 'iloveyou', 'monkey', 'dragon', 'football', 'baseball', 'soccer',
  'sunshine', 'princess', 'master', 'shadow', 'monkey123', 'batman', 'trustno', 'starwars', 'whatever', 'freedom',
  'secret', 'changeme', 'default', 'login', 'abc', 'abcdef', 'abcdefgh', 'abcdefghij', 'computer', 'internet',
  'hello', 'hellohello', 'charlie', 'michael', 'jennifer', 'jordan', 'hunter', 'ranger', 'killer', 'pepper',
  'summer', 'winter', 'spring', 'autumn', 'starsway', 'galaxy', 'planet', 'telescope', 'universe', 'astronomy',
])

/** Why a password is too easy to guess, or null when it is acceptable (length is checked by the schema). */
export function weakPasswordReason(password: string): string | null {
  const lower = password.toLowerCase()
  const core = lower.replace(/^[^a-z]+|[^a-z]+$/g, '') // "Password12!" -> "password"
  if (COMMON.has(core) || COMMON.has(lower.replace(/[^a-z0-9]/g, ''))) return 'is one of the most common passwords: choose a phrase of unrelated words'
  if (new Set(lower).size < 4) return 'repeats too few characters: choose a phrase of unrelated words'
  if (/^[0-9\s]+$/.test(lower)) return 'is only digits: choose a phrase of unrelated words'
  if (isRun(lower)) return 'is a keyboard or alphabet run: choose a phrase of unrelated words'
  return null
}

/** "abcdefghij", "1234567890", "9876543210": each character one step from the previous. */
function isRun(s: string): boolean {
  if (s.length < 4) return false
  const d = s.charCodeAt(1) - s.charCodeAt(0)
  if (Math.abs(d) !== 1) return false
  for (let i = 2; i < s.length; i++) if (s.charCodeAt(i) - s.charCodeAt(i - 1) !== d) return false
  return true
}
