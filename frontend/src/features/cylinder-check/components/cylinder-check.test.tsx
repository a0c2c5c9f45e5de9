// @vitest-environment happy-dom
import { afterEach, describe, expect, it } from 'vitest';
import { cleanup, render, screen, waitFor } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { CylinderCheck, PLANNING_AID, type CylinderTypeOption, type GasOption } from './cylinder-check';

const site = { name: 'Test site', unitSystem: 'metric', referenceCode: '15C', atmosphericBar: 1.01325, storeTemperatureC: 15, cylinderColours: 'ISO32' };
const gases: GasOption[] = [
  { code: 'O2', name: 'Oxygen', iso32Colours: ['#ffffff'], cgaColours: ['#2e8b57'] },
  { code: 'N2O', name: 'Nitrous oxide', iso32Colours: ['#1e4a8c'], cgaColours: ['#1e4a8c'] },
  { code: 'N2O_O2_50', name: 'Nitrous oxide/oxygen 50:50', iso32Colours: ['#1e4a8c', '#ffffff'], cgaColours: [] },
];
const types: CylinderTypeOption[] = [{ id: 1, name: '10 L · 200 bar', gasCode: 'O2', waterCapacityL: 10, fillPressureBar: 200, tareKg: null, active: true }];

afterEach(cleanup);

describe('CylinderCheck', () => {
  it('shows the time remaining, the caution and the method once the reading and flow are in', async () => {
    const user = userEvent.setup();
    render(<CylinderCheck site={site} gases={gases} cylinderTypes={types} />);
    expect(screen.getByText(PLANNING_AID)).toBeTruthy();
    await user.selectOptions(screen.getByLabelText('Cylinder type'), '1');
    await user.type(screen.getByLabelText('Gauge reading'), '100');
    await user.type(screen.getByLabelText('Flow'), '5');
    // pV = nRT by hand: 10 L × 100 bar / 1.01325 bar ≈ 987 L; at 5 L/min ≈ 197 min. Real oxygen holds a few % more.
    await waitFor(() => expect(screen.getAllByText(/^3 h \d+ min$/).length).toBeGreaterThan(0));
    expect(screen.getByText(/real gas: .+; ideal: pV = nRT/)).toBeTruthy();
    expect(document.body.textContent).not.toMatch(/NaN|Infinity/);
  });

  it('asks for weights, not the gauge, for nitrous oxide', async () => {
    const user = userEvent.setup();
    render(<CylinderCheck site={site} gases={gases} cylinderTypes={types} />);
    await user.selectOptions(screen.getByLabelText('Gas'), 'N2O');
    expect(screen.queryByLabelText('Gauge reading')).toBeNull();
    expect(screen.getByText(/the gauge does not show the contents/i)).toBeTruthy();
    expect(screen.getByLabelText('Gross weight')).toBeTruthy();
  });

  it('warns at the temperature field when the 50:50 mixture is colder than about −6 °C', async () => {
    const user = userEvent.setup();
    render(<CylinderCheck site={site} gases={gases} cylinderTypes={types} />);
    await user.selectOptions(screen.getByLabelText('Gas'), 'N2O_O2_50');
    const t = screen.getByLabelText('Gas temperature');
    await user.clear(t);
    await user.type(t, '-8');
    expect(await screen.findByText(/may have separated/i)).toBeTruthy();
  });

  it('marks a reading that is not a number, and shows no figures', async () => {
    const user = userEvent.setup();
    render(<CylinderCheck site={site} gases={gases} cylinderTypes={types} />);
    await user.type(screen.getByLabelText('Water capacity'), '10');
    await user.type(screen.getByLabelText('Gauge reading'), '1o0');
    await user.type(screen.getByLabelText('Flow'), '2');
    expect(await screen.findByText(/Gauge reading must be a number/)).toBeTruthy();
    expect(screen.queryByText('Time remaining')).toBeNull();
    expect(document.body.textContent).not.toMatch(/NaN/);
  });
});
