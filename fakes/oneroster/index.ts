export {
  startOneRosterFake,
  type OneRosterFake,
  type OneRosterFakeOptions,
} from './oneroster-fake.js';
export { demoRoster, type RosterData } from './roster-data.js';
