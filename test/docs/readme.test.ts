import { describe, expect, it } from 'vitest';
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { parsePlan } from '../../src/core/plan/validate';
import { COMMANDS } from '../../src/cli/main';

const readme = readFileSync(join(__dirname, '../../README.md'), 'utf8');

describe('README', () => {
  it('opens with one paragraph stating the job', () => {
    const paragraphs = readme.split(/\n\s*\n/);
    expect(paragraphs[0]).toMatch(/^# Haloweave$/);
    expect(paragraphs[1]).toMatch(/slit-mask/);
    expect(paragraphs[1]).toMatch(/calcium-triplet/);
  });

  it('says masks must pass the observatory checks before fabrication', () => {
    expect(readme).toMatch(/must still pass the observatory's own mask checks/);
  });

  it('shows a plan example that the plan validator accepts', () => {
    const block = readme.match(/```json\n([\s\S]*?)```/);
    expect(block).not.toBeNull();
    const plan = parsePlan(JSON.parse(block![1]), 'README example');
    expect(plan.goals.masks).toBe(4);
  });

  it('lists every command of the CLI', () => {
    for (const name of Object.keys(COMMANDS)) expect(readme).toContain(`haloweave ${name}`);
  });
});
