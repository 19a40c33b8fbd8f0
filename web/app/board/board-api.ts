import { HttpClient } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import { boardSummarySchema, type BoardSummary } from '@shared/domain/board-summary';
import { firstValueFrom } from 'rxjs';

/** Where the printable PDF of the board summary is served (same session cookie as the page). */
export const BOARD_SUMMARY_PDF_URL = '/api/board/summary.pdf';

/** The board's network summary; the answer is parsed with the shared schema. */
@Injectable({ providedIn: 'root' })
export class BoardApi {
  private readonly http = inject(HttpClient);

  async summary(): Promise<BoardSummary> {
    return boardSummarySchema.parse(await firstValueFrom(this.http.get('/api/board/summary')));
  }
}
