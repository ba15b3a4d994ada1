import { afterEach } from 'vitest';
import { clock } from '../../server/lib/clock';

afterEach(() => clock.reset());
