/** Chart.js with only the parts the plots use registered (keeps the bundle small), and our hover mode. */
import { Chart, Interaction, Legend, LinearScale, LineElement, PointElement, ScatterController, Title, Tooltip } from 'chart.js';
import { nearestPoint } from './plugins.ts';

// Title is for exported images; on screen the panel's caption carries the title
Chart.register(ScatterController, LineElement, PointElement, LinearScale, Tooltip, Legend, Title);
Chart.defaults.font.family = 'system-ui, "Segoe UI", Roboto, "Noto Sans", sans-serif';
Chart.defaults.font.size = 12;
Chart.defaults.color = '#2b2f36';
Chart.defaults.animation = false;
Interaction.modes.nearestPoint = nearestPoint;

export { Chart };
