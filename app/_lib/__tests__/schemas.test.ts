import { describe, expect, it } from 'vitest';
import { fromZod } from '../errors';
import { idField, inviteSchema, newPasswordField, personNameField, setPasswordSchema, signInSchema, TOO_LONG_PASSWORD } from '../schemas';

function firstError(result: { success: boolean; error?: { issues: { message: string }[] } }): string | undefined {
  return result.success ? undefined : result.error?.issues[0]?.message;
}

describe('password rules', () => {
  it.each([
    ['short-1', 'Use at least 10 characters.'],
    ['onlyletterslong', 'Add at least one digit or symbol.'],
    ['1111111111', 'Use more varied characters.'],
    // 73 bytes, and 37 accented letters = 74 bytes: bcrypt would read only the first 72.
    ['x'.repeat(71) + '12', TOO_LONG_PASSWORD],
    ['é'.repeat(36) + '-1', TOO_LONG_PASSWORD],
  ])('refuses %j: %s', (password, message) => {
    expect(firstError(newPasswordField.safeParse(password))).toBe(message);
  });

  it('accepts a long varied password, up to 72 bytes', () => {
    expect(newPasswordField.safeParse('larkspur-operator-1').success).toBe(true);
    expect(newPasswordField.safeParse('ab-1234567'.repeat(7) + 'xy').success).toBe(true);
  });
});

describe('form schemas', () => {
  it('normalises e-mail to lower case and trims it', () => {
    expect(signInSchema.parse({ email: '  Tamsin@Larkspur.EXAMPLE ', password: 'x' }).email).toBe('tamsin@larkspur.example');
  });

  it('flattens zod errors into field errors for the form', () => {
    const parsed = inviteSchema.safeParse({ email: 'nope', name: '', role: 'wizard' });
    if (parsed.success) throw new Error('should fail');
    const result = fromZod(parsed.error);
    expect(result).toMatchObject({ ok: false, code: 'bad_request:input', message: 'Check the highlighted fields.' });
    expect(result.fieldErrors).toEqual({
      email: ['That is not an e-mail address.'],
      name: ['Enter the person’s name.'],
      role: ['Choose a role.'],
    });
  });

  it('puts a mismatched confirmation on the confirm field', () => {
    const parsed = setPasswordSchema.safeParse({ token: 't'.repeat(43), password: 'good-pass-123', confirm: 'good-pass-124' });
    if (parsed.success) throw new Error('should fail');
    expect(fromZod(parsed.error).fieldErrors).toEqual({ confirm: ['The two passwords differ.'] });
  });
});

describe('person names', () => {
  it('keep one line of letters of any script, marks, digits and a little punctuation, spaces collapsed', () => {
    expect(personNameField.parse('  Zoë   O’Brien-Ågren ')).toBe('Zoë O’Brien-Ågren');
    // NFC: "e" + combining acute becomes "é".
    expect(personNameField.parse('Rene\u0301e Dubois')).toBe('Renée Dubois');
    expect(personNameField.safeParse('Νίκη Παππά (QA)').success).toBe(true);
  });

  it.each([['line feed', 'A\nB'], ['bidi isolate', 'Ann\u2066a'], ['zero-width joiner', 'An\u200dna'], ['no-break space', 'Ann\u00a0Lee'], ['angle brackets', '<b>Ann</b>'], ['at sign', 'ann@x']])(
    'refuse a %s',
    (_what, name) => {
      expect(firstError(personNameField.safeParse(name))).toBe("Use one line of letters, digits, spaces and . , ’ ' - ( ) only.");
    },
  );
});

describe('ids', () => {
  it('are PostgreSQL integers: 1 to 2³¹ − 1', () => {
    expect(idField.parse('2147483647')).toBe(2147483647);
    for (const bad of ['2147483648', '0', '-3', '1.5', 'abc', '1e400']) expect(idField.safeParse(bad).success, bad).toBe(false);
  });
});
