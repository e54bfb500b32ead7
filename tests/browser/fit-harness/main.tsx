// A page with the dataset fit panel alone (no server), for the browser test of fitting a large
// dataset in the fit worker: ?rows=N sets the size (default a million).
import '../../../app/globals.css';
import { createRoot } from 'react-dom/client';
import { FitPanel } from '../../../components/datasets/FitPanel';
import { walkSeries } from './walkData';

const rows = Number(new URLSearchParams(location.search).get('rows') ?? 1_000_000);
const series = walkSeries(rows);

createRoot(document.getElementById('root')!).render(<FitPanel series={series} />);
