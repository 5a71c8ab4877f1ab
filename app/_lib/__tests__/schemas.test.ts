import { describe, expect, it } from 'vitest';
import { fromZod } from '../errors';
import { inviteSchema, newPasswordField, setPasswordSchema, signInSchema } from '../schemas';

function firstError(result: { success: boolean; error?: { issues: { message: string }[] } }): string | undefined {
  return result.success ? undefined : result.error?.issues[0]?.message;
}

describe('password rules', () => {
  it.each([
    ['short-1', 'Use at least 10 characters.'],
    ['onlyletterslong', 'Add at least one digit or symbol.'],
    ['1111111111', 'Use more varied characters.'],
    ['x'.repeat(199) + '12', 'Use at most 200 characters.'],
  ])('refuses %j: %s', (password, message) => {
    expect(firstError(newPasswordField.safeParse(password))).toBe(message);
  });

  it('accepts a long varied password', () => {
    expect(newPasswordField.safeParse('larkspur-operator-1').success).toBe(true);
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
