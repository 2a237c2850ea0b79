import { type AbstractControl, type ValidationErrors, type ValidatorFn } from '@angular/forms';
import { passwordProblem } from '@kinetwin/shared/protocol/library-api';

/**
 * A form validator applying the server's password rule (shared passwordProblem) to the `password`
 * control against the e-mail `emailOf` gives, so the page says what is wrong before sending.
 * The error's value is the sentence to show.
 */
export function passwordRule(emailOf: () => string): ValidatorFn {
  return (control: AbstractControl): ValidationErrors | null => {
    const value = String(control.value ?? '');
    if (value === '') return null;
    const problem = passwordProblem(value, emailOf());
    return problem ? { passwordRule: problem } : null;
  };
}
