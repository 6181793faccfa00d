/**
 * The one place the charting library is loaded, modularly (only the chart
 * types and components used), so it lands in a chunk of its own that only
 * chart pages fetch, through LazyCharts.
 *
 * A small binding of our own instead of echarts-for-react: that package's
 * compiled build requires tslib, which it does not declare, so it cannot be
 * bundled from this install.
 */
import { BarChart, CustomChart, LineChart, ScatterChart } from "echarts/charts";
import { GridComponent, LegendComponent, MarkAreaComponent, MarkLineComponent, TooltipComponent } from "echarts/components";
import * as echarts from "echarts/core";
import { SVGRenderer } from "echarts/renderers";
import { useEffect, useRef } from "react";
import type { ChartOption } from "./options";

echarts.use([BarChart, CustomChart, LineChart, ScatterChart, GridComponent, LegendComponent, MarkAreaComponent, MarkLineComponent, TooltipComponent, SVGRenderer]);

export default function EChart({ option, label }: { option: ChartOption; label: string }) {
  const element = useRef<HTMLDivElement>(null);
  const chart = useRef<echarts.ECharts | null>(null);

  useEffect(() => {
    const instance = echarts.init(element.current!, null, { renderer: "svg" });
    chart.current = instance;
    const resize = new ResizeObserver(() => instance.resize());
    resize.observe(element.current!);
    return () => {
      resize.disconnect();
      instance.dispose();
      chart.current = null;
    };
  }, []);

  useEffect(() => {
    chart.current?.setOption(option, { notMerge: true });
  }, [option]);

  return <div ref={element} role="img" aria-label={label} style={{ height: 320, width: "100%" }} />;
}
