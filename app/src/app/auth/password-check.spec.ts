import { FormControl } from '@angular/forms';
import { passwordRule } from './password-check';

describe('passwordRule', () => {
  const check = (password: string, email = 'rhea@lab.test') => new FormControl(password, { validators: [passwordRule(() => email)] }).errors;

  it('accepts a long varied password and leaves an empty one to the required rule', () => {
    expect(check('copper-gantry-42')).toBeNull();
    expect(check('')).toBeNull();
  });

  it('says why a password is refused, in the server’s words', () => {
    expect(check('short')).toEqual({ passwordRule: 'password must be at least 10 characters' });
    expect(check('aaaaaaaaaaaa')).toEqual({ passwordRule: 'password must not be one character repeated' });
    expect(check('my-rhea-password')).toEqual({ passwordRule: 'password must not contain your e-mail name' });
  });
});
