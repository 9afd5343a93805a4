/**
 * The code nearly every screen shares (Angular Material's form field, select, dialog and
 * overlay, the forms package, zod, the API's schemas, the music tables and the common data
 * classes), named in one place that every screen imports for its side effect only.
 *
 * esbuild's code splitting puts each module in a chunk by the set of entry points (here, the lazy
 * screens) that reach it (esbuild docs, "Splitting": "code shared between multiple entry points is
 * split off into a separate shared file"), so a module used by a different set of screens than its
 * neighbours became a file of its own: the pass-off screen needed about forty-five. Every screen
 * reaching these modules through this one file gives them the same set, and so one chunk, fetched
 * in one request. Nothing is imported from here; the names exist only to be reached.
 */
export * as zod from 'zod';
export * as forms from '@angular/forms';
export * as rxjsInterop from '@angular/core/rxjs-interop';
export * as cdkA11y from '@angular/cdk/a11y';
export * as cdkBidi from '@angular/cdk/bidi';
export * as cdkCollections from '@angular/cdk/collections';
export * as cdkDialog from '@angular/cdk/dialog';
export * as cdkLayout from '@angular/cdk/layout';
export * as cdkOverlay from '@angular/cdk/overlay';
export * as cdkPlatform from '@angular/cdk/platform';
export * as cdkPortal from '@angular/cdk/portal';
export * as cdkScrolling from '@angular/cdk/scrolling';
export * as cdkTextField from '@angular/cdk/text-field';
export * as matButton from '@angular/material/button';
export * as matCore from '@angular/material/core';
export * as matDialog from '@angular/material/dialog';
export * as matFormField from '@angular/material/form-field';
export * as matIcon from '@angular/material/icon';
export * as matInput from '@angular/material/input';
export * as matProgressBar from '@angular/material/progress-bar';
export * as matProgressSpinner from '@angular/material/progress-spinner';
export * as matSelect from '@angular/material/select';
export * as analyticsApi from '@shared/api/analytics';
export * as capabilitiesApi from '@shared/api/capabilities';
export * as ensembleApi from '@shared/api/ensemble';
export * as fieldsApi from '@shared/api/fields';
export * as ladderApi from '@shared/api/ladder';
export * as listApi from '@shared/api/list';
export * as meApi from '@shared/api/me';
export * as passOffApi from '@shared/api/pass-off';
export * as rolesApi from '@shared/api/roles';
export * as schoolYearApi from '@shared/api/school-year';
export * as dayText from '@shared/calendar/day-text';
export * as instruments from '@shared/music/instruments';
export * as scales from '@shared/music/scales';
export * as transposition from '@shared/music/transposition';
export * as confirmDialog from './confirm-dialog/confirm-dialog';
export * as parse from './parse';
export * as pageState from './state/page-state';
export * as write from './state/write';
export * as ensembleData from '../ensembles/ensemble-data';
export * as ladderData from '../ladder/ladder-data';
export * as schoolYearData from '../school-years/school-year-data';
export * as yearPicker from '../school-years/year-picker/year-picker';
export * as dateText from '../ladder/date-text';
export * as requirementText from '../ladder/requirement-text';
export * as passOffData from '../pass-offs/pass-off-data';
export * as allPages from '../pass-offs/all-pages';
export * as unsentPassOffs from '../pass-offs/unsent-pass-offs';
export * as practiceLabels from '../practice/labels';
export * as takes from '../practice/take-panel/takes';
export * as takeRecorder from '../practice/take-panel/take-recorder';
export * as takeJob from '../practice/take-panel/take-job';
export * as takeAnalysisView from '../practice/take-panel/take-analysis-view';
export * as takeSession from '../practice/take-panel/take-session';
