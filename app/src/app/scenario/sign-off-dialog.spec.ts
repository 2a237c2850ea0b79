import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { type ComponentFixture, TestBed } from '@angular/core/testing';
import { SAFETY_CAUTION } from '@kinetwin/shared/protocol/library-api';
import { SignOffDialog } from './sign-off-dialog';

describe('SignOffDialog', () => {
  let fixture: ComponentFixture<SignOffDialog>;
  let http: HttpTestingController;
  let root: HTMLElement;

  async function settle(): Promise<void> {
    await new Promise((resolve) => setTimeout(resolve));
    await fixture.whenStable();
  }

  beforeEach(async () => {
    TestBed.configureTestingModule({ providers: [provideHttpClient(), provideHttpClientTesting()] });
    http = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(SignOffDialog);
    root = fixture.nativeElement;
    fixture.componentRef.setInput('scenarioId', 9);
    fixture.componentRef.setInput('revision', 4);
    await settle();
  });

  afterEach(() => http.verify());

  const confirm = () => root.querySelector<HTMLButtonElement>('[data-test=confirm-sign-off]')!;

  it('shows the safety caution and keeps sign-off off until it is acknowledged', async () => {
    expect(root.querySelector('[data-test=safety-caution]')?.textContent).toContain(SAFETY_CAUTION);
    expect(confirm().disabled).toBe(true);
    root.querySelector<HTMLInputElement>('[data-test=acknowledge-safety] input')!.click();
    await settle();
    expect(confirm().disabled).toBe(false);
  });

  it('sends the acknowledgement with the note and reports the signed revision', async () => {
    const signed: number[] = [];
    fixture.componentInstance.signed.subscribe((revision) => signed.push(revision.number));
    root.querySelector<HTMLInputElement>('[data-test=acknowledge-safety] input')!.click();
    const note = root.querySelector<HTMLInputElement>('[data-test=sign-off-note]')!;
    note.value = ' meets limits ';
    note.dispatchEvent(new Event('input'));
    await settle();
    confirm().click();
    const request = http.expectOne('/api/scenarios/9/revisions/4/sign-off');
    expect(request.request.body).toEqual({ acknowledgeSafety: true, note: 'meets limits' });
    request.flush({
      revision: { number: 4, note: '', author: { id: 1, displayName: 'Rhea' }, createdAt: '', signOff: { by: { id: 2, displayName: 'Tomás' }, at: '', note: 'meets limits' }, scenarioId: 9, scenario: {} },
      safetyCaution: SAFETY_CAUTION,
    });
    await settle();
    expect(signed).toEqual([4]);
  });

  it("shows the server's refusal", async () => {
    root.querySelector<HTMLInputElement>('[data-test=acknowledge-safety] input')!.click();
    await settle();
    confirm().click();
    http.expectOne('/api/scenarios/9/revisions/4/sign-off').flush({ error: { code: 'already_signed_off', message: 'Revision 4 is already signed off and cannot change.' } }, { status: 409, statusText: 'Conflict' });
    await settle();
    expect(root.querySelector('[data-test=sign-off-error]')?.textContent).toContain('already signed off');
  });
});
