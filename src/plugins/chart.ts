// Chart.js, registered once for the whole app: the pieces the line charts use (lines, points,
// linear axes, area fill, tooltip, legend). Every chart goes through components/LineChart.vue.
import { CategoryScale, Chart, Filler, Legend, LinearScale, LineElement, PointElement, Tooltip } from 'chart.js';

export function registerCharts() {
  Chart.register(LineElement, PointElement, LinearScale, CategoryScale, Filler, Tooltip, Legend);
}
