import { describe, expect, it } from 'vitest';
import { checkNewPassword } from '../../../../src/features/auth/components/check-new-password';

describe('checkNewPassword', () => {
  it('accepts a long, varied password repeated exactly', () => {
    expect(checkNewPassword('copper trace at dawn', 'copper trace at dawn')).toEqual({});
  });

  it('says when the two entries differ', () => {
    expect(checkNewPassword('copper trace at dawn', 'copper trace at dusk')).toEqual({
      repeat: 'The two passwords do not match',
    });
  });

  it('asks for the repeat when it is empty', () => {
    expect(checkNewPassword('copper trace at dawn', '')).toEqual({ repeat: 'Repeat the password' });
  });

  it('applies the shared minimum length (10 characters, shared/schemas/auth.ts)', () => {
    expect(checkNewPassword('short1', 'short1').password).toBe('Password must be at least 10 characters');
  });

  it('rejects a password from the shared list of obvious ones', () => {
    expect(checkNewPassword('Password123', 'Password123').password).toBe('This password is too common; choose another');
  });

  it('reports both problems at once', () => {
    const errors = checkNewPassword('aaaaaaaaaaaa', 'b');
    expect(errors.password).toBe('Password repeats too few different characters');
    expect(errors.repeat).toBe('The two passwords do not match');
  });
});
