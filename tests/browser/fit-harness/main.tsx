// A page with the dataset fit panel alone (no server), for the browser test of fitting a large
// dataset in the fit worker: ?rows=N sets the size (default a million), ?y=… the y quantity.
import '../../../app/globals.css';
import { createRoot } from 'react-dom/client';
import { FitPanel } from '../../../components/datasets/FitPanel';
import { walkSeries } from './walkData';

const query = new URLSearchParams(location.search);
const rows = Number(query.get('rows') ?? 1_000_000);
const series = walkSeries(rows);
const quantity = query.get('y');
if (quantity) series.y.quantity = quantity;

createRoot(document.getElementById('root')!).render(<FitPanel series={series} />);
