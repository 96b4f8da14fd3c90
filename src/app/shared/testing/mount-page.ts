import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import type { EnvironmentProviders, Provider, Type } from '@angular/core';
import { ComponentFixture, TestBed } from '@angular/core/testing';
import { provideRouter } from '@angular/router';

/** A page created for a spec, with the HTTP backend that answers its requests. */
export interface MountedPage<T> {
  fixture: ComponentFixture<T>;
  element: HTMLElement;
  backend: HttpTestingController;
}

/**
 * Creates a routed page for a spec: HttpClient with the testing backend, an empty router, the
 * given extra providers and route inputs; runs the first change detection (so its loads start).
 */
export function mountPage<T>(
  page: Type<T>,
  inputs: Record<string, unknown>,
  providers: (Provider | EnvironmentProviders)[] = [],
): MountedPage<T> {
  TestBed.configureTestingModule({
    imports: [page],
    providers: [provideHttpClient(), provideHttpClientTesting(), provideRouter([]), ...providers],
  });
  const backend = TestBed.inject(HttpTestingController);
  const fixture = TestBed.createComponent(page);
  for (const [name, value] of Object.entries(inputs)) fixture.componentRef.setInput(name, value);
  fixture.detectChanges();
  return { fixture, element: fixture.nativeElement as HTMLElement, backend };
}

/** Resolves after `ms` milliseconds. */
export const wait = (ms: number) => new Promise<void>((r) => setTimeout(r, ms));

/** Lets answered requests land and the page draw them (two change detections with waits between). */
export async function settlePage(fixture: ComponentFixture<unknown>): Promise<void> {
  await wait(20);
  fixture.detectChanges();
  await wait(10);
  fixture.detectChanges();
}

/** Types `value` into the field of `root` bound to the form control `name`, as a person would (an input event). */
export function typeInto(root: HTMLElement, name: string, value: string): void {
  const field = root.querySelector<HTMLInputElement | HTMLTextAreaElement>(`[formcontrolname="${name}"]`);
  if (!field) throw new Error(`No field for the form control "${name}"`);
  field.value = value;
  field.dispatchEvent(new Event('input'));
}
