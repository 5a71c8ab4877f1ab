import { describe, expect, it } from 'vitest';
import { navigationFor } from '../navigation';

describe('navigationFor', () => {
  it('shows each role only the areas it may open', () => {
    const labels = (role: Parameters<typeof navigationFor>[0]) => navigationFor(role).map((i) => i.label);
    expect(labels('operator')).toEqual(['Overview', 'Runs', 'Upload', 'Designs', 'Materials', 'Compare', 'Account']);
    expect(labels('engineer')).toEqual(['Overview', 'Runs', 'Upload', 'Designs', 'Materials', 'Compare', 'Account']);
    expect(labels('supervisor')).toEqual(['Overview', 'Runs', 'Upload', 'Designs', 'Materials', 'Compare', 'Audit log', 'Account']);
    expect(labels('admin')).toEqual(['Overview', 'Runs', 'Upload', 'Designs', 'Materials', 'Compare', 'Audit log', 'Users', 'Mail', 'Chamber tokens', 'Account']);
  });
});
