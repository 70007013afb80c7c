import { Settings } from 'luxon';
import { clock } from './clock';

// Luxon's DateTime.now() (and every default it fills from "now") reads the one clock. Imported
// for its effect by the code that uses luxon on the server side and in tests.
Settings.now = clock.ms;
