import { Injectable, inject } from '@angular/core';
import { MatIconRegistry } from '@angular/material/icon';
import { DomSanitizer } from '@angular/platform-browser';
import spaceDashboard from '@material-symbols/svg-400/outlined/space_dashboard.svg';
import school from '@material-symbols/svg-400/outlined/school.svg';
import groups from '@material-symbols/svg-400/outlined/groups.svg';
import person from '@material-symbols/svg-400/outlined/person.svg';
import uploadFile from '@material-symbols/svg-400/outlined/upload_file.svg';
import stairs from '@material-symbols/svg-400/outlined/stairs.svg';
import factCheck from '@material-symbols/svg-400/outlined/fact_check.svg';
import musicNote from '@material-symbols/svg-400/outlined/music_note.svg';
import piano from '@material-symbols/svg-400/outlined/piano.svg';
import inventory2 from '@material-symbols/svg-400/outlined/inventory_2.svg';
import handshake from '@material-symbols/svg-400/outlined/handshake.svg';
import build from '@material-symbols/svg-400/outlined/build.svg';
import outgoingMail from '@material-symbols/svg-400/outlined/outgoing_mail.svg';
import manageAccounts from '@material-symbols/svg-400/outlined/manage_accounts.svg';
import logout from '@material-symbols/svg-400/outlined/logout.svg';
import menu from '@material-symbols/svg-400/outlined/menu.svg';
import search from '@material-symbols/svg-400/outlined/search.svg';
import add from '@material-symbols/svg-400/outlined/add.svg';
import edit from '@material-symbols/svg-400/outlined/edit.svg';
import deleteIcon from '@material-symbols/svg-400/outlined/delete.svg';
import download from '@material-symbols/svg-400/outlined/download.svg';
import print from '@material-symbols/svg-400/outlined/print.svg';
import playArrow from '@material-symbols/svg-400/outlined/play_arrow.svg';
import pause from '@material-symbols/svg-400/outlined/pause.svg';
import stop from '@material-symbols/svg-400/outlined/stop.svg';
import error from '@material-symbols/svg-400/outlined/error.svg';
import info from '@material-symbols/svg-400/outlined/info.svg';
import warning from '@material-symbols/svg-400/outlined/warning.svg';
import check from '@material-symbols/svg-400/outlined/check.svg';
import close from '@material-symbols/svg-400/outlined/close.svg';
import chevronRight from '@material-symbols/svg-400/outlined/chevron_right.svg';
import arrowBack from '@material-symbols/svg-400/outlined/arrow_back.svg';
import checkBox from '@material-symbols/svg-400/outlined/check_box.svg';
import checkBoxOutlineBlank from '@material-symbols/svg-400/outlined/check_box_outline_blank.svg';
import viewColumn from '@material-symbols/svg-400/outlined/view_column.svg';
import refresh from '@material-symbols/svg-400/outlined/refresh.svg';
import key from '@material-symbols/svg-400/outlined/key.svg';
import cloudOff from '@material-symbols/svg-400/outlined/cloud_off.svg';
import schedule from '@material-symbols/svg-400/outlined/schedule.svg';
import libraryMusic from '@material-symbols/svg-400/outlined/library_music.svg';
import checklist from '@material-symbols/svg-400/outlined/checklist.svg';
// The instrument fleet's screens.
import checkCircle from '@material-symbols/svg-400/outlined/check_circle.svg';
import sanitizer from '@material-symbols/svg-400/outlined/sanitizer.svg';
import help from '@material-symbols/svg-400/outlined/help.svg';
import block from '@material-symbols/svg-400/outlined/block.svg';
import bookmarkAdd from '@material-symbols/svg-400/outlined/bookmark_add.svg';
import shoppingCart from '@material-symbols/svg-400/outlined/shopping_cart.svg';
import keyboardReturn from '@material-symbols/svg-400/outlined/keyboard_return.svg';
import taskAlt from '@material-symbols/svg-400/outlined/task_alt.svg';
import barcodeScanner from '@material-symbols/svg-400/outlined/barcode_scanner.svg';
import weight from '@material-symbols/svg-400/outlined/weight.svg';
import eventBusy from '@material-symbols/svg-400/outlined/event_busy.svg';
import draw from '@material-symbols/svg-400/outlined/draw.svg';
import pending from '@material-symbols/svg-400/outlined/pending.svg';
import addAPhoto from '@material-symbols/svg-400/outlined/add_a_photo.svg';
import send from '@material-symbols/svg-400/outlined/send.svg';
import mail from '@material-symbols/svg-400/outlined/mail.svg';
import swapHoriz from '@material-symbols/svg-400/outlined/swap_horiz.svg';
import localShipping from '@material-symbols/svg-400/outlined/local_shipping.svg';
import arrowUpward from '@material-symbols/svg-400/outlined/arrow_upward.svg';
import arrowDownward from '@material-symbols/svg-400/outlined/arrow_downward.svg';
import publish from '@material-symbols/svg-400/outlined/publish.svg';
import attachFile from '@material-symbols/svg-400/outlined/attach_file.svg';
import history from '@material-symbols/svg-400/outlined/history.svg';
// People and API tokens.
import personAdd from '@material-symbols/svg-400/outlined/person_add.svg';
import personOff from '@material-symbols/svg-400/outlined/person_off.svg';
import howToReg from '@material-symbols/svg-400/outlined/how_to_reg.svg';
import contentCopy from '@material-symbols/svg-400/outlined/content_copy.svg';
import keyboardArrowDown from '@material-symbols/svg-400/outlined/keyboard_arrow_down.svg';
// The Overview's charts and the Reports screens.
import table from '@material-symbols/svg-400/outlined/table.svg';
import barChart from '@material-symbols/svg-400/outlined/bar_chart.svg';
import hourglassEmpty from '@material-symbols/svg-400/outlined/hourglass_empty.svg';
import markEmailRead from '@material-symbols/svg-400/outlined/mark_email_read.svg';
import scheduleSend from '@material-symbols/svg-400/outlined/schedule_send.svg';
import eventRepeat from '@material-symbols/svg-400/outlined/event_repeat.svg';

/** The icons the app uses, shipped in the bundle from the Material Symbols package. */
const icons: Record<string, string> = {
  space_dashboard: spaceDashboard,
  school: school,
  groups: groups,
  person: person,
  upload_file: uploadFile,
  stairs: stairs,
  fact_check: factCheck,
  music_note: musicNote,
  piano: piano,
  inventory_2: inventory2,
  handshake: handshake,
  build: build,
  outgoing_mail: outgoingMail,
  manage_accounts: manageAccounts,
  logout: logout,
  menu: menu,
  search: search,
  add: add,
  edit: edit,
  delete: deleteIcon,
  download: download,
  print: print,
  play_arrow: playArrow,
  pause: pause,
  stop: stop,
  error: error,
  info: info,
  warning: warning,
  check: check,
  close: close,
  chevron_right: chevronRight,
  arrow_back: arrowBack,
  check_box: checkBox,
  check_box_outline_blank: checkBoxOutlineBlank,
  view_column: viewColumn,
  refresh: refresh,
  key: key,
  cloud_off: cloudOff,
  schedule: schedule,
  library_music: libraryMusic,
  checklist: checklist,
  check_circle: checkCircle,
  sanitizer: sanitizer,
  help: help,
  block: block,
  bookmark_add: bookmarkAdd,
  shopping_cart: shoppingCart,
  keyboard_return: keyboardReturn,
  task_alt: taskAlt,
  barcode_scanner: barcodeScanner,
  weight: weight,
  event_busy: eventBusy,
  draw: draw,
  pending: pending,
  add_a_photo: addAPhoto,
  send: send,
  mail: mail,
  swap_horiz: swapHoriz,
  local_shipping: localShipping,
  arrow_upward: arrowUpward,
  arrow_downward: arrowDownward,
  publish: publish,
  attach_file: attachFile,
  history: history,
  person_add: personAdd,
  person_off: personOff,
  how_to_reg: howToReg,
  content_copy: contentCopy,
  keyboard_arrow_down: keyboardArrowDown,
  table: table,
  bar_chart: barChart,
  hourglass_empty: hourglassEmpty,
  mark_email_read: markEmailRead,
  schedule_send: scheduleSend,
  event_repeat: eventRepeat,
};

/** Registers the icons as inline SVGs, so no icon font or request leaves the app. */
@Injectable({ providedIn: 'root' })
export class Icons {
  private readonly registry = inject(MatIconRegistry);
  private readonly sanitizer = inject(DomSanitizer);

  register(): void {
    for (const [name, svg] of Object.entries(icons)) {
      // The SVGs come from our own bundle, never from user input.
      this.registry.addSvgIconLiteral(name, this.sanitizer.bypassSecurityTrustHtml(svg));
    }
  }
}
