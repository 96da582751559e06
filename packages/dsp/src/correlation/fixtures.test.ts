import { describe, it } from 'vitest';
import { correlationFixtureDir, loadCorrelationFixture } from '../../test/correlation-support.ts';
import { expectScriptsReproduce, hasScipy } from '../../test/fixture-scripts.ts';

describe('correlation reference fixtures', () => {
  it.skipIf(!hasScipy)(
    'are reproduced by tests/reference/efi_reference.py (skipped when python3 cannot import scipy)',
    () => expectScriptsReproduce(['efi_reference.py'], correlationFixtureDir, loadCorrelationFixture),
    120_000,
  );
});
