import { describe, expect, it } from 'vitest';
import { barByBarBase, percentAxis, sideCategoryAxis } from './chart-base';

describe('barByBarBase', () => {
  it('should describe the bar under the pointer, with no legend and the room asked for beside the bars', () => {
    const names = ['Grade 5', 'Grade 6'];
    const option = barByBarBase(104, (index) => `<b>${names[index]}</b>`);
    const tooltip = option.tooltip as {
      trigger: string;
      formatter: (parameter: unknown) => string;
    };
    // ECharts option reference, tooltip.formatter (from memory): an item tooltip gets one item, with dataIndex.
    expect(tooltip.trigger).toBe('item');
    expect(tooltip.formatter({ dataIndex: 1 })).toBe('<b>Grade 6</b>');
    expect(option.legend).toEqual({ show: false });
    expect(option.grid).toMatchObject({ top: 28, right: 104, containLabel: true });
  });
});

describe('percentAxis and sideCategoryAxis', () => {
  it('should run shares from 0 to 100 and list categories top down with every label shown', () => {
    expect(percentAxis()).toMatchObject({ type: 'value', max: 100, interval: 25 });
    const axis = sideCategoryAxis(['FHM', 'OVH'], { lineHeight: 15 });
    expect(axis).toMatchObject({ type: 'category', data: ['FHM', 'OVH'], inverse: true });
    expect(axis.axisLabel).toMatchObject({ interval: 0, lineHeight: 15 });
    expect(axis.axisLabel).not.toHaveProperty('hideOverlap');
  });
});
