// The icons of the shell (top bar and navigation) and of the pass-off entry, shipped in their
// code as text (angular.json's `loader` for `.svg`) rather than fetched one file each: on a slow
// link each fetch is a round trip, and the navigation alone draws twenty. Every other icon is
// fetched from /icons/ when a screen first shows it.
import spaceDashboardSvg from '@material-symbols/svg-400/outlined/space_dashboard.svg';
import schoolSvg from '@material-symbols/svg-400/outlined/school.svg';
import groupsSvg from '@material-symbols/svg-400/outlined/groups.svg';
import personSvg from '@material-symbols/svg-400/outlined/person.svg';
import uploadFileSvg from '@material-symbols/svg-400/outlined/upload_file.svg';
import stairsSvg from '@material-symbols/svg-400/outlined/stairs.svg';
import factCheckSvg from '@material-symbols/svg-400/outlined/fact_check.svg';
import musicNoteSvg from '@material-symbols/svg-400/outlined/music_note.svg';
import pianoSvg from '@material-symbols/svg-400/outlined/piano.svg';
import inventory2Svg from '@material-symbols/svg-400/outlined/inventory_2.svg';
import handshakeSvg from '@material-symbols/svg-400/outlined/handshake.svg';
import buildSvg from '@material-symbols/svg-400/outlined/build.svg';
import outgoingMailSvg from '@material-symbols/svg-400/outlined/outgoing_mail.svg';
import manageAccountsSvg from '@material-symbols/svg-400/outlined/manage_accounts.svg';
import logoutSvg from '@material-symbols/svg-400/outlined/logout.svg';
import menuSvg from '@material-symbols/svg-400/outlined/menu.svg';
import domainSvg from '@material-symbols/svg-400/outlined/domain.svg';
import eventRepeatSvg from '@material-symbols/svg-400/outlined/event_repeat.svg';
import paymentsSvg from '@material-symbols/svg-400/outlined/payments.svg';
import keySvg from '@material-symbols/svg-400/outlined/key.svg';
import barcodeScannerSvg from '@material-symbols/svg-400/outlined/barcode_scanner.svg';
import historySvg from '@material-symbols/svg-400/outlined/history.svg';
import arrowBackSvg from '@material-symbols/svg-400/outlined/arrow_back.svg';
import chevronRightSvg from '@material-symbols/svg-400/outlined/chevron_right.svg';
import checkSvg from '@material-symbols/svg-400/outlined/check.svg';
import closeSvg from '@material-symbols/svg-400/outlined/close.svg';
import editSvg from '@material-symbols/svg-400/outlined/edit.svg';

/** Each inlined icon's SVG text, by its Material Symbols name. */
export const inlineIcons: Readonly<Record<string, string>> = {
  space_dashboard: spaceDashboardSvg,
  school: schoolSvg,
  groups: groupsSvg,
  person: personSvg,
  upload_file: uploadFileSvg,
  stairs: stairsSvg,
  fact_check: factCheckSvg,
  music_note: musicNoteSvg,
  piano: pianoSvg,
  inventory_2: inventory2Svg,
  handshake: handshakeSvg,
  build: buildSvg,
  outgoing_mail: outgoingMailSvg,
  manage_accounts: manageAccountsSvg,
  logout: logoutSvg,
  menu: menuSvg,
  domain: domainSvg,
  event_repeat: eventRepeatSvg,
  payments: paymentsSvg,
  key: keySvg,
  barcode_scanner: barcodeScannerSvg,
  history: historySvg,
  arrow_back: arrowBackSvg,
  chevron_right: chevronRightSvg,
  check: checkSvg,
  close: closeSvg,
  edit: editSvg,
};
