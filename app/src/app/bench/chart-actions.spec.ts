import { PLOT_CONFIG, resetView } from './chart-actions';

describe('chart actions', () => {
  it('hide the stock mode bar and every link out of the app', () => {
    expect(PLOT_CONFIG).toMatchObject({ displayModeBar: false, showSendToCloud: false, displaylogo: false });
  });

  it('reset each axis to its own range, or to autoscale when it had none', () => {
    expect(resetView({ xaxis: { range: [0, 2], autorange: false }, yaxis: { autorange: true }, yaxis2: {}, margin: { l: 1 } } as never)).toEqual({
      'xaxis.range': [0, 2],
      'xaxis.autorange': false,
      'yaxis.autorange': true,
      'yaxis2.autorange': true,
    });
  });
});
