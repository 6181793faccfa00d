/**
 * The one place the charting library is loaded, modularly (only the chart
 * types and components used), so it lands in a chunk of its own that only
 * chart pages fetch, through LazyCharts.
 */
import { BarChart, CustomChart, LineChart, ScatterChart } from "echarts/charts";
import { GridComponent, LegendComponent, MarkAreaComponent, MarkLineComponent, TooltipComponent } from "echarts/components";
import * as echarts from "echarts/core";
import { SVGRenderer } from "echarts/renderers";
import ReactEChartsCore from "echarts-for-react/esm/core";
import type { ChartOption } from "./options";

echarts.use([BarChart, CustomChart, LineChart, ScatterChart, GridComponent, LegendComponent, MarkAreaComponent, MarkLineComponent, TooltipComponent, SVGRenderer]);

export default function EChart({ option, label }: { option: ChartOption; label: string }) {
  return (
    <div role="img" aria-label={label}>
      <ReactEChartsCore echarts={echarts} option={option} notMerge opts={{ renderer: "svg" }} style={{ height: 320, width: "100%" }} />
    </div>
  );
}
