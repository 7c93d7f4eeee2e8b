// The Winnow library page: plain JavaScript, no dependencies. The token lives in sessionStorage (this tab only),
// goes out as an Authorization header and never into a URL. Every number shown comes from the public API.
'use strict';

const TOKEN_KEY = 'winnow.token';
const SECTIONS = ['significance', 'stability', 'breadth', 'variants', 'after_costs', 'rationale', 'redundancy'];
const SVG_TYPE = 'image/svg+xml';

class ApiError extends Error {
  constructor(status, detail) {
    super(detail);
    this.status = status;
  }
}

function token() {
  return sessionStorage.getItem(TOKEN_KEY);
}

async function api(path, accept) {
  const response = await fetch(path, {
    headers: { 'Authorization': 'Bearer ' + token(), 'Accept': accept || 'application/json' },
    cache: 'no-cache',
    credentials: 'omit',
  });
  if (!response.ok) {
    let detail = response.statusText;
    try {
      detail = (await response.json()).detail || detail;
    } catch (ignored) {
      // the body was not a problem document
    }
    throw new ApiError(response.status, detail);
  }
  return accept === SVG_TYPE ? response.text() : response.json();
}

/** A DOM element: el('td', {class: 'num'}, 'text', child, ...). Text is always set as text, never as markup. */
function el(tag, attributes, ...children) {
  const node = document.createElement(tag);
  for (const [name, value] of Object.entries(attributes || {})) {
    if (value !== null && value !== undefined && value !== false) {
      node.setAttribute(name, value === true ? '' : String(value));
    }
  }
  for (const child of children.flat()) {
    if (child !== null && child !== undefined) {
      node.append(child instanceof Node ? child : document.createTextNode(String(child)));
    }
  }
  return node;
}

function svgEl(tag, attributes) {
  const node = document.createElementNS('http://www.w3.org/2000/svg', tag);
  for (const [name, value] of Object.entries(attributes || {})) {
    node.setAttribute(name, String(value));
  }
  return node;
}

function status(message, isError) {
  const s = document.getElementById('status');
  s.textContent = message || '';
  s.classList.toggle('error', Boolean(isError));
}

function fail(error) {
  if (error instanceof ApiError && error.status === 401) {
    sessionStorage.removeItem(TOKEN_KEY);
    showTokenState();
    status('The token was not accepted (' + error.message + ') Paste a valid token above.', true);
  } else {
    status('Could not load: ' + (error.message || error), true);
  }
}

function fixed(value, digits) {
  return value === null || value === undefined ? '\u2014' : Number(value).toFixed(digits);
}

function pValue(value) {
  if (value === null || value === undefined) {
    return '\u2014';
  }
  return value < 0.0001 ? '<0.0001' : Number(value).toFixed(4);
}

function words(verdict) {
  return verdict.replace(/_/g, ' ');
}

function sectionName(key) {
  return key.replace(/_/g, ' ');
}

function verdictBadge(section, verdict) {
  return el('span', { class: 'verdict verdict-' + verdict }, sectionName(section) + ': ' + words(verdict));
}

/** Replaces the main content and moves focus to its heading, so keyboard and screen-reader users land there. */
function render(...children) {
  const main = document.getElementById('main');
  main.replaceChildren(...children);
  const heading = main.querySelector('h1');
  if (heading) {
    heading.setAttribute('tabindex', '-1');
    heading.focus();
  }
}

function markNav(current) {
  for (const id of ['nav-library', 'nav-themes']) {
    const link = document.getElementById(id);
    if (id === current) {
      link.setAttribute('aria-current', 'page');
    } else {
      link.removeAttribute('aria-current');
    }
  }
}

/** Runs tasks with at most `limit` at a time (the evidence of one factor is a heavy request). */
async function pooled(items, limit, task) {
  let next = 0;
  async function worker() {
    while (next < items.length) {
      const item = items[next++];
      await task(item);
    }
  }
  await Promise.all(Array.from({ length: Math.min(limit, items.length) }, worker));
}

function sparkline(dates, cumulative) {
  const width = 120;
  const height = 28;
  const svg = svgEl('svg', { width, height, viewBox: `0 0 ${width} ${height}`, class: 'spark', 'aria-hidden': 'true', focusable: 'false' });
  if (cumulative.length < 2) {
    return svg;
  }
  const wealth = cumulative.map((c) => 1 + c);
  const lo = Math.min(...wealth, 1);
  const hi = Math.max(...wealth, 1);
  const span = hi - lo || 1;
  const points = wealth.map((w, i) => `${(i / (wealth.length - 1) * (width - 2) + 1).toFixed(1)},${(height - 2 - (w - lo) / span * (height - 4)).toFixed(1)}`);
  const base = (height - 2 - (1 - lo) / span * (height - 4)).toFixed(1);
  svg.append(svgEl('line', { x1: 0, x2: width, y1: base, y2: base, stroke: '#BFBFBF', 'stroke-width': 1 }));
  svg.append(svgEl('polyline', { points: points.join(' '), fill: 'none', stroke: '#0072B2', 'stroke-width': 1.5 }));
  return svg;
}

async function showLibrary() {
  markNav('nav-library');
  status('Loading the library\u2026');
  const [list, evidence] = await Promise.all([api('/v1/factors'), api('/v1/evidence')]);
  const rows = new Map();
  for (const row of evidence.factors) {
    rows.set(row.factor + '@' + row.version, row);
  }
  const excluded = new Map();
  for (const e of evidence.excluded) {
    excluded.set(e.factor + '@' + e.version, e.reason);
  }
  const body = el('tbody');
  const verdictCells = new Map();
  const sparkCells = new Map();
  for (const f of list.factors) {
    const row = rows.get(f.name + '@' + f.version);
    const reason = excluded.get(f.name + '@' + f.version);
    const verdicts = el('td', { 'data-factor': f.name, class: 'verdict-cell' }, el('span', { class: 'pending' }, 'loading\u2026'));
    const spark = el('td', {});
    verdictCells.set(f.name, verdicts);
    sparkCells.set(f.name, spark);
    const missing = row ? null : (reason || 'not in the evidence table (status ' + f.status + ')');
    const cell = (value) => el('td', { class: 'num', title: missing }, value);
    body.append(el('tr', { 'data-factor': f.name },
      el('th', { scope: 'row' }, el('a', { href: '#factor/' + encodeURIComponent(f.name), class: 'factor-link' }, f.name)),
      el('td', {}, f.role === 'input' ? 'input (no trial)' : (f.definition && f.definition.theme) || '\u2014'),
      spark,
      cell(row ? fixed(row.nw_t_stat, 2) : '\u2014'),
      verdicts,
      cell(row ? pValue(row.p_bonferroni) : '\u2014'),
      cell(row ? pValue(row.p_holm) : '\u2014'),
      cell(row ? pValue(row.p_bh) : '\u2014'),
      cell(row ? pValue(row.p_by) : '\u2014')));
  }
  const table = el('table', { id: 'library' },
    el('caption', {}, `${list.factors.length} live factors; ${evidence.trials} trials count toward the haircuts (monthly basis).`),
    el('thead', {}, el('tr', {},
      el('th', { scope: 'col' }, 'Factor'),
      el('th', { scope: 'col' }, 'Theme'),
      el('th', { scope: 'col' }, 'Cumulative return'),
      el('th', { scope: 'col', class: 'num' }, 'NW t'),
      el('th', { scope: 'col' }, 'Evidence verdicts'),
      el('th', { scope: 'col', class: 'num' }, 'p Bonferroni'),
      el('th', { scope: 'col', class: 'num' }, 'p Holm'),
      el('th', { scope: 'col', class: 'num' }, 'p BH'),
      el('th', { scope: 'col', class: 'num' }, 'p BY'))),
    body);
  render(el('h1', {}, 'Factor library'),
    el('p', {}, 'Open a factor for its charts, evidence and definition. Haircut p-values adjust the Newey-West p-value for every trial ever built (Bonferroni, Holm, Benjamini-Hochberg, Benjamini-Yekutieli).'),
    table);
  status('');
  const names = list.factors.map((f) => f.name);
  pooled(names, 4, async (name) => {
    const data = await api('/v1/factors/' + encodeURIComponent(name) + '/returns?form=cumulative');
    const s = sparkCells.get(name);
    const last = data.returns.length ? data.returns[data.returns.length - 1] : null;
    s.replaceChildren(sparkline(data.dates, data.returns),
      el('span', { class: 'sr-only' }, last === null ? 'no returns yet' : `${(last * 100).toFixed(0)}% to ${data.dates[data.dates.length - 1]}`));
  }).catch(fail);
  let done = 0;
  await pooled(names, 3, async (name) => {
    const target = verdictCells.get(name);
    try {
      const report = await api('/v1/factors/' + encodeURIComponent(name) + '/evidence');
      target.replaceChildren(el('ul', { class: 'verdicts' }, SECTIONS.filter((k) => report[k]).map((k) => el('li', {}, verdictBadge(k, report[k].verdict)))));
    } catch (error) {
      target.replaceChildren(el('span', {}, 'evidence unavailable: ' + error.message));
    }
    done++;
    status(done < names.length ? `Evidence loaded for ${done} of ${names.length} factors\u2026` : '');
  });
}

async function chartFigure(kind, path) {
  const text = await api(path, SVG_TYPE);
  const doc = new DOMParser().parseFromString(text, SVG_TYPE);
  const svg = doc.documentElement;
  if (svg.nodeName !== 'svg' || doc.getElementsByTagName('parsererror').length) {
    throw new Error('the ' + kind + ' chart could not be read');
  }
  // ids are unique per chart, not per page: prefix them, and the labels that point at them
  for (const node of svg.querySelectorAll('[id]')) {
    node.id = kind + '-' + node.id;
  }
  const labelledBy = svg.getAttribute('aria-labelledby');
  if (labelledBy) {
    svg.setAttribute('aria-labelledby', labelledBy.split(' ').map((id) => kind + '-' + id).join(' '));
  }
  return el('figure', { class: 'chart', 'data-chart': kind }, document.importNode(svg, true));
}

// methods whose factors have stored bucket portfolios, and those whose signal has information coefficients
const PORTFOLIO_METHODS = ['sort', 'size_sort'];
const SIGNAL_METHODS = ['sort', 'size_sort', 'rank_weighted'];

async function showCharts(name, method, holder) {
  const log = document.getElementById('opt-log').checked;
  const net = document.getElementById('opt-net').checked;
  const base = '/v1/factors/' + encodeURIComponent(name) + '/charts/';
  const size = '?width=900&height=380';
  const query = (extra) => size + (net ? '&net=true' : '') + extra;
  status('Drawing charts\u2026');
  const wanted = [
    chartFigure('cumulative', base + 'cumulative' + query(log ? '&log=true' : '')),
    chartFigure('drawdowns', base + 'drawdowns' + query('')),
    chartFigure('significance', base + 'significance' + query('')),
  ];
  // bucket means and information coefficients are gross and on their own basis: the net switch does not apply
  if (PORTFOLIO_METHODS.includes(method)) {
    wanted.push(chartFigure('portfolios', base + 'portfolios' + size));
  }
  if (SIGNAL_METHODS.includes(method)) {
    wanted.push(chartFigure('ic', base + 'ic' + size + '&horizons=1,3,6,12'));
  }
  const figures = await Promise.all(wanted);
  holder.replaceChildren(...figures);
  status('');
}

function sectionBox(key, section) {
  const numbers = [];
  for (const [k, v] of Object.entries(section)) {
    if (typeof v === 'number' && !['verdict'].includes(k)) {
      numbers.push(el('li', {}, `${k.replace(/_/g, ' ')}: ${Number.isInteger(v) ? v : v.toPrecision(4)}`));
    }
  }
  return el('section', { class: 'section', 'data-section': key, 'aria-labelledby': 'sec-' + key },
    el('h3', { id: 'sec-' + key }, sectionName(key)),
    el('p', {}, el('strong', {}, 'Verdict: '), verdictBadge(key, section.verdict)),
    el('p', {}, section.reason),
    numbers.length ? el('ul', {}, numbers) : null);
}

async function showFactor(name) {
  markNav(null);
  status('Loading ' + name + '\u2026');
  const factor = await api('/v1/factors/' + encodeURIComponent(name));
  const charts = el('div', { class: 'charts', id: 'charts' }, el('p', {}, 'Drawing charts\u2026'));
  const sections = el('div', { class: 'sections', id: 'sections' }, el('p', {}, 'Loading evidence\u2026'));
  const controls = el('form', { class: 'controls', id: 'chart-options' },
    el('span', {}, el('input', { type: 'checkbox', id: 'opt-log' }), ' ', el('label', { for: 'opt-log' }, 'Log scale for the cumulative return')),
    el('span', {}, el('input', { type: 'checkbox', id: 'opt-net' }), ' ', el('label', { for: 'opt-net' }, 'Net of trading costs')));
  const def = factor.definition || {};
  render(
    el('p', {}, el('a', { href: '#library' }, '\u2190 Back to the library')),
    el('h1', {}, name),
    el('p', {}, `Theme ${def.theme || '\u2014'}; method ${def.method || '\u2014'}; version ${factor.version} of ${factor.current_version}; `
      + `${factor.observations} observations from ${factor.first_date || '\u2014'} to ${factor.last_date || '\u2014'}; status ${factor.status}.`),
    el('h2', {}, 'Charts'),
    controls,
    charts,
    el('h2', {}, 'Evidence'),
    sections,
    el('h2', {}, 'Definition'),
    def.rationale ? el('p', {}, el('strong', {}, 'Rationale: '), def.rationale) : null,
    el('pre', { class: 'definition', tabindex: '0', 'aria-label': 'Definition as JSON' }, JSON.stringify(def, null, 2)));
  controls.addEventListener('change', () => showCharts(name, def.method, charts).catch(fail));
  await Promise.all([
    showCharts(name, def.method, charts),
    api('/v1/factors/' + encodeURIComponent(name) + '/evidence').then((report) => {
      sections.replaceChildren(...SECTIONS.filter((k) => report[k]).map((k) => sectionBox(k, report[k])));
    }),
  ]);
  status('');
}

async function showThemes() {
  markNav('nav-themes');
  status('Loading themes\u2026');
  const themes = await api('/v1/themes');
  const declared = el('ul', { id: 'declared' }, themes.declared.map((g) => el('li', {}, el('strong', {}, g.theme + ': '), g.factors.join(', '))));
  const clusters = el('ul', { id: 'clusters' }, themes.clusters.map((c) => el('li', {}, el('strong', {}, 'cluster ' + (c.cluster + 1) + ': '), c.factors.join(', '))));
  const disagreements = themes.disagreements.length
    ? el('table', {}, el('caption', {}, 'Where the declared themes and the clusters disagree'),
      el('thead', {}, el('tr', {}, el('th', { scope: 'col' }, 'Factors'), el('th', { scope: 'col' }, 'Kind'), el('th', { scope: 'col', class: 'num' }, 'Correlation'))),
      el('tbody', {}, themes.disagreements.map((d) => el('tr', {}, el('td', {}, d.factors.join(' and ')), el('td', {}, words(d.kind)), el('td', { class: 'num' }, fixed(d.correlation, 2))))))
    : el('p', {}, 'The clusters agree with the declared themes.');
  const heat = el('div', { class: 'charts' });
  render(el('h1', {}, 'Themes'),
    el('p', {}, `Declared themes beside clusters of the monthly correlations (average linkage on 1 \u2212 correlation, cut at ${themes.threshold}).`),
    el('div', { class: 'columns' },
      el('section', { 'aria-labelledby': 'h-declared' }, el('h2', { id: 'h-declared' }, 'Declared themes'), declared),
      el('section', { 'aria-labelledby': 'h-clusters' }, el('h2', { id: 'h-clusters' }, 'Correlation clusters'), clusters)),
    disagreements,
    el('h2', {}, 'Correlations'),
    heat);
  const names = themes.clusters.flatMap((c) => c.factors);
  if (names.length >= 2) {
    heat.append(await chartFigure('correlations', '/v1/charts/correlations?factors=' + names.map(encodeURIComponent).join(',')
      + '&frequency=monthly&width=900&height=' + Math.min(3000, 160 + 44 * names.length)));
  }
  status('');
}

function route() {
  if (!token()) {
    render(el('h1', {}, 'Factor library'), el('p', {}, 'Paste an API token above to see the library.'));
    return;
  }
  const hash = decodeURIComponent(location.hash.replace(/^#/, ''));
  let work;
  if (hash.startsWith('factor/')) {
    work = showFactor(hash.substring('factor/'.length));
  } else if (hash === 'themes') {
    work = showThemes();
  } else {
    work = showLibrary();
  }
  work.catch(fail);
}

function showTokenState() {
  document.getElementById('token-forget').hidden = !token();
  document.getElementById('token').required = !token();
}

document.addEventListener('DOMContentLoaded', () => {
  const form = document.getElementById('token-form');
  form.addEventListener('submit', (event) => {
    event.preventDefault();
    const input = document.getElementById('token');
    const value = input.value.trim();
    if (!value) {
      status('Paste a token first.', true);
      return;
    }
    sessionStorage.setItem(TOKEN_KEY, value);
    input.value = '';
    showTokenState();
    status('');
    route();
  });
  document.getElementById('token-forget').addEventListener('click', () => {
    sessionStorage.removeItem(TOKEN_KEY);
    showTokenState();
    status('Token forgotten.');
    route();
  });
  window.addEventListener('hashchange', route);
  showTokenState();
  route();
});
