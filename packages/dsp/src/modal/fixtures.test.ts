import { describe, it } from 'vitest';
import { expectScriptsReproduce, hasScipy } from '../../test/fixture-scripts.ts';
import { loadModalFixture, modalFixtureDir } from '../../test/modal-systems.ts';

describe('modal reference fixtures', () => {
  it.skipIf(!hasScipy)(
    'are reproduced by tests/reference/modal_fixtures.py (skipped when python3 cannot import scipy)',
    () => expectScriptsReproduce(['modal_fixtures.py'], modalFixtureDir, loadModalFixture),
    60_000,
  );
});
