// Entry of a survey planning worker thread: registers tsx so the TypeScript worker module loads without a build step.
import { register } from 'tsx/esm/api';

register();
await import('./planWorker.ts');
