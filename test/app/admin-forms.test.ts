import { describe, expect, it } from 'vitest';
import { checkNewPerson, checkNewPin } from '../../src/app/admin-forms';
import { isGuessablePin, lastAdminProblem, type Person } from '../../src/schema';

const people: Person[] = [
  { id: 'p-a', name: 'Ada', login: 'ada', role: 'admin', active: true },
  { id: 'p-b', name: 'Ben', login: 'ben', role: 'engineer', active: true },
  { id: 'p-c', name: 'Cleo', login: 'cleo', role: 'admin', active: false },
];
const ok = { name: 'Nadia', login: 'nadia', role: 'operator' as const, pin: '4826', pinAgain: '4826' };

describe('checkNewPerson()', () => {
  it('gives the request the server takes, with the name trimmed', () => {
    expect(checkNewPerson({ ...ok, name: '  Nadia  ' }, people)).toEqual({ ok: true, value: { name: 'Nadia', login: 'nadia', role: 'operator', pin: '4826' } });
  });

  it('says what is wrong, one message per field', () => {
    const r = checkNewPerson({ name: '', login: 'a b', role: '', pin: '12', pinAgain: '' }, people);
    expect(r).toEqual({
      ok: false,
      errors: {
        name: 'Name is needed.',
        login: 'A login uses only letters, digits, dot, dash and underscore (no spaces).',
        role: 'Choose a role.',
        pin: 'A PIN is 4 to 12 digits (0–9).',
        pinAgain: 'Type the PIN a second time.',
      },
    });
  });

  it('refuses a login in use at the site, whatever its case, and says whose it is', () => {
    expect(checkNewPerson({ ...ok, login: 'CLEO' }, people)).toEqual({ ok: false, errors: { login: 'This login is already used by Cleo (access withdrawn).' } });
  });
});

describe('checkNewPin()', () => {
  it('applies the PIN rule and the repetition', () => {
    expect(checkNewPin('5281', '5281')).toEqual({ ok: true, value: '5281' });
    expect(checkNewPin('5281', '5218')).toEqual({ ok: false, errors: { pinAgain: 'The two PINs are not the same.' } });
    expect(checkNewPin('4444', '4444')).toMatchObject({ ok: false, errors: { pin: expect.stringMatching(/too easy to guess/) } });
  });
});

describe('isGuessablePin()', () => {
  it('catches repeated digits and runs up or down by one, and nothing else', () => {
    for (const pin of ['0000', '1234', '3210', '56789', '987654']) expect(isGuessablePin(pin)).toBe(true);
    for (const pin of ['1357', '9753', '2468', '1243', '8080', '4826']) expect(isGuessablePin(pin)).toBe(false);
  });
});

describe('lastAdminProblem()', () => {
  it('refuses to withdraw or demote the only active admin (an inactive admin does not count)', () => {
    expect(lastAdminProblem(people, 'p-a', { active: false })).toMatch(/^You cannot withdraw the access of Ada: they are the site's only active admin/);
    expect(lastAdminProblem(people, 'p-a', { role: 'engineer' })).toMatch(/^You cannot change the role of Ada/);
    expect(lastAdminProblem(people, 'p-a', { role: 'admin' })).toBeUndefined();
    expect(lastAdminProblem(people, 'p-b', { active: false })).toBeUndefined();
  });

  it('allows it once someone else is an active admin', () => {
    const two = people.map((p) => (p.id === 'p-b' ? { ...p, role: 'admin' as const } : p));
    expect(lastAdminProblem(two, 'p-a', { active: false })).toBeUndefined();
  });
});
