/**
 * A printed page's frame: a line (study code, version) repeated at the top of
 * every printed page. It is the header of a layout table, because Chromium
 * repeats a table's header on each printed page and keeps room for it, where
 * a fixed element would run over the page's first lines. Page numbers come
 * from the @page margin boxes in app.css. On screen the frame is plain blocks
 * and the line is hidden.
 */
import type { ReactNode } from "react";

export function PrintFrame({ header, children }: { header: ReactNode; children: ReactNode }) {
  return (
    <table className="print-frame" role="presentation">
      <thead>
        <tr>
          <td>
            <div className="print-header" data-testid="print-header">
              {header}
            </div>
          </td>
        </tr>
      </thead>
      <tbody>
        <tr>
          <td>{children}</td>
        </tr>
      </tbody>
    </table>
  );
}
