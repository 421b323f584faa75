/**
 * Passwords people reach for first, generated here from patterns of our own (no third-party
 * list): obvious words and names with the usual endings, keyboard walks, counting runs and
 * repeated characters. Together with the minimum length this refuses the guesses an attacker
 * tries first; it is not meant to be exhaustive.
 */
const WORDS = [
  'password',
  'passwort',
  'passw0rd',
  'p@ssword',
  'qwerty',
  'letmein',
  'welcome',
  'admin',
  'administrator',
  'iloveyou',
  'monkey',
  'dragon',
  'football',
  'baseball',
  'soccer',
  'sunshine',
  'princess',
  'shadow',
  'master',
  'superman',
  'batman',
  'trustno1',
  'whatever',
  'freedom',
  'starwars',
  'computer',
  'internet',
  'secret',
  'changeme',
  'default',
  'login',
  'hello',
  'summer',
  'winter',
  'spring',
  'autumn',
  'fluxwalk',
  'flux',
  'soil',
  'collar',
  'chamber',
  'field',
  'station',
  'forest',
  'research',
  'science',
  'student',
  'teacher',
  'michael',
  'jennifer',
  'charlie',
  'thomas',
];
const ENDINGS = ['', '1', '12', '123', '1234', '12345', '123456', '!', '1!', '123!', '2024', '2025', '2026', '01', '69', '99'];

const WALKS = [
  '1234567890',
  '12345678910',
  '0987654321',
  '9876543210',
  'qwertyuiop',
  'qwertzuiop',
  'azertyuiop',
  'asdfghjkl',
  'asdfghjkl;',
  'zxcvbnm',
  'zxcvbnm123',
  '1q2w3e4r5t',
  '1q2w3e4r5t6y',
  'q1w2e3r4t5',
  '1qaz2wsx3edc',
  'qazwsxedc',
  'qazwsxedcrfv',
  'abcdefghij',
  'abcdefghijk',
  'abc1234567',
  'abcd123456',
  'a1b2c3d4e5',
  '123qweasdzxc',
  'qweasdzxc',
  '1234qwer',
  '1234qwerasdf',
  'qwerty123456',
  'iloveyou123',
];

function build(): Set<string> {
  const out = new Set<string>();
  for (const w of WORDS) for (const e of ENDINGS) out.add(w + e);
  for (const w of WALKS) out.add(w);
  return out;
}

export const COMMON_PASSWORDS: ReadonlySet<string> = build();

/** The listed words, for "a listed word plus digits or punctuation" (password2027!). */
export const COMMON_WORDS: readonly string[] = WORDS;
