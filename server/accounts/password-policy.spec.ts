import { COMMON_PASSWORDS } from './common-passwords';
import { passwordProblem } from './password-policy';

describe('password policy', () => {
  it('when a password is an obvious word with the usual endings, then it is refused as too common', () => {
    for (const p of ['password123', 'Password2026!', 'SUNSHINE12345', 'qwertyuiop', '1q2w3e4r5t', 'fluxwalk2025', 'letmein!!!!!']) {
      expect([p, passwordProblem(p, 'someone@fluxwalk.example')]).toEqual([p, expect.stringMatching(/too common/)]);
    }
  });

  it('when a password is long, unlisted and unrelated to the address, then it passes', () => {
    expect(passwordProblem('Tussock-ridge-walker-8', 'moss.campion@fluxwalk.example')).toBeNull();
  });

  it('when a password is short, one repeated character or holds the address, then the reason is named', () => {
    expect(passwordProblem('short', 'a@b.c')).toBe('Use at least 10 characters');
    expect(passwordProblem('zzzzzzzzzzzz', 'a@b.c')).toMatch(/repeat/);
    expect(passwordProblem('campion-in-the-rain', 'campion@fluxwalk.example')).toMatch(/e-mail address/);
  });

  it('when the list is built, then it holds several hundred entries, all lower case', () => {
    expect(COMMON_PASSWORDS.size).toBeGreaterThan(500);
    expect([...COMMON_PASSWORDS].every((p) => p === p.toLowerCase())).toBe(true);
  });
});
