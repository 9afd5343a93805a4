import { keyName, toMusicXml } from '@shared/music';
import { patternLabels } from './labels';
import { musicXmlFileName, type ReadySheet } from './sheet';

/** The MusicXML document of a sheet, in the pitch it is shown in. */
export function sheetMusicXml(sheet: ReadySheet): string {
  const { request } = sheet;
  return toMusicXml({
    title: `Concert ${keyName(sheet.concertKey)}: ${patternLabels[request.pattern]}`,
    instrumentId: sheet.instrument.id,
    key: sheet.concertKey,
    notes: sheet.staff.notes,
    pitch: request.pitch,
    tempo: request.tempo,
    articulation: request.articulation,
  });
}

/** Saves a sheet as a .musicxml file through the browser's download, without a server. */
export function downloadMusicXml(sheet: ReadySheet): void {
  const blob = new Blob([sheetMusicXml(sheet)], {
    // The MIME type the MusicXML 4.0 specification registers for uncompressed files.
    type: 'application/vnd.recordare.musicxml+xml',
  });
  const url = URL.createObjectURL(blob);
  const link = document.createElement('a');
  link.href = url;
  link.download = musicXmlFileName(sheet.request);
  document.body.append(link);
  link.click();
  link.remove();
  setTimeout(() => URL.revokeObjectURL(url), 1000);
}
