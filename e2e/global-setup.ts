import type { TestProject } from 'vitest/node';
import { startAppProcess } from './app-process';

declare module 'vitest' {
  export interface ProvidedContext {
    baseUrl: string;
  }
}

/** One real server for the browser tests, started from the built app in dist/. */
export default async function setup(project: TestProject) {
  const app = await startAppProcess();
  project.provide('baseUrl', app.baseUrl);
  return () => app.stop();
}
