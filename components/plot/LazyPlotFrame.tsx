'use client';
// The plot frame's drawing code (recharts, ~0.7 MB before minifying) is fetched the first time a
// plot is drawn, not with the page: the whiteboard's code then evaluates sooner and the editor
// mounts earlier. Until it arrives the frame keeps its place with its caption and an empty box of
// the drawing's height, so nothing below it moves.
import { lazy, Suspense } from 'react';
import type { PlotFrameProps } from './PlotFrame';

const DEFAULT_HEIGHT = 340;

let drawing: Promise<{ default: typeof import('./PlotFrame').PlotFrame }> | null = null;

/** Starts fetching the drawing code (once); a page may call it when it expects a plot soon. */
export function preloadPlotFrame(): Promise<{ default: typeof import('./PlotFrame').PlotFrame }> {
  drawing ??= import('./PlotFrame').then((m) => ({ default: m.PlotFrame }));
  return drawing;
}

const PlotFrameDrawing = lazy(preloadPlotFrame);

function PlotFramePlaceholder({ title, height }: Pick<PlotFrameProps, 'title' | 'height'>) {
  return (
    <figure className="my-3" aria-busy="true" data-plot-frame-loading="">
      <figcaption className="mb-1 text-ink">{title}</figcaption>
      <div style={{ height: height ?? DEFAULT_HEIGHT }} />
    </figure>
  );
}

export function PlotFrame(props: PlotFrameProps) {
  return (
    <Suspense fallback={<PlotFramePlaceholder title={props.title} height={props.height} />}>
      <PlotFrameDrawing {...props} />
    </Suspense>
  );
}
