// ECharts, registered piece by piece so the bundle holds only what the charts use.
// Canvas draws on screen and gives PNG snapshots; the SVG renderer makes vector snapshots.
import { use } from 'echarts/core'
import { CanvasRenderer, SVGRenderer } from 'echarts/renderers'
import { CustomChart, LineChart, ScatterChart } from 'echarts/charts'
import {
  DataZoomComponent, GridComponent, LegendComponent, MarkLineComponent, TitleComponent,
  ToolboxComponent, TooltipComponent,
} from 'echarts/components'

use([
  CanvasRenderer, SVGRenderer, ScatterChart, LineChart, CustomChart, GridComponent, TooltipComponent,
  LegendComponent, DataZoomComponent, ToolboxComponent, TitleComponent, MarkLineComponent,
])
