'use client';
// The plot frame's drawing code (recharts, ~0.7 MB before minifying) is fetched the first time a
// plot is drawn, not with the page: the whiteboard's code then evaluates sooner and the editor
// mounts earlier. Until it arrives the frame keeps its place with its caption and an empty box of
// the drawing's height, so nothing below it moves.
import { clientModule } from '../clientModule';
import type { PlotFrameProps } from './PlotFrame';

const DEFAULT_HEIGHT = 340;

const drawingCode = clientModule(() => import('./PlotFrame'));

function PlotFramePlaceholder({ title, height, failed }: Pick<PlotFrameProps, 'title' | 'height'> & { failed: boolean }) {
  return (
    <figure className="my-3" aria-busy={!failed} data-plot-frame-loading="">
      <figcaption className="mb-1 text-ink">{title}</figcaption>
      <div style={{ height: height ?? DEFAULT_HEIGHT }} className="flex items-center justify-center text-sm text-ink-faint">
        {failed ? 'The drawing code could not be fetched: reload the page to draw the plot.' : null}
      </div>
    </figure>
  );
}

export function PlotFrame(props: PlotFrameProps) {
  const { module: drawing, failed } = drawingCode.use();
  if (!drawing) return <PlotFramePlaceholder title={props.title} height={props.height} failed={failed} />;
  return <drawing.PlotFrame {...props} />;
}
