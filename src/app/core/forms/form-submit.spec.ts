import { FormControl, FormGroup, Validators } from '@angular/forms';
import { FormSubmit } from './form-submit';

function emailForm(email = 'crew@fluxwalk.example') {
  return new FormGroup({ email: new FormControl(email, { nonNullable: true, validators: [Validators.required, Validators.email] }) });
}

describe('FormSubmit', () => {
  it('when a second submit comes while the first is running, then the second does nothing', async () => {
    const submit = new FormSubmit(emailForm(), () => 'failed');
    let finish!: () => void;
    const work = jest.fn(() => new Promise<void>((resolve) => (finish = resolve)));

    const first = submit.run(work);
    await submit.run(work);
    expect(work).toHaveBeenCalledTimes(1);
    expect(submit.busy()).toBe(true);

    finish();
    await first;
    expect(submit.busy()).toBe(false);
  });

  it('when the form is invalid, then every field is marked touched and the work does not run', async () => {
    const form = emailForm('');
    const submit = new FormSubmit(form, () => 'failed');
    const work = jest.fn(async () => undefined);

    await submit.run(work);

    expect(work).not.toHaveBeenCalled();
    expect(form.controls.email.touched).toBe(true);
    expect(submit.busy()).toBe(false);
  });

  it('when the work fails, then the problem is the described error and busy is cleared', async () => {
    const submit = new FormSubmit(emailForm(), (err) => `Not sent: ${(err as Error).message}`);

    await submit.run(async () => {
      throw new Error('server down');
    });

    expect(submit.problem()).toBe('Not sent: server down');
    expect(submit.busy()).toBe(false);
  });

  it('when a later submit succeeds, then the earlier problem is cleared', async () => {
    const submit = new FormSubmit(emailForm(), () => 'The invitation was not sent.');
    await submit.run(async () => {
      throw new Error('offline');
    });
    expect(submit.problem()).toBe('The invitation was not sent.');

    await submit.run(async () => undefined);

    expect(submit.problem()).toBe('');
  });
});
