// trivet desk: the page. Plain JavaScript, no framework, no network reference
// other than the desk's own /api/ endpoints (docs/desk-api.md).
//
// The beam is held as the beam file's JSON (a copy of what was loaded): the
// tables edit fields of it in place through JSON Pointers, so fields the
// tables do not show are kept as they were, and what is saved is an ordinary
// beam file. Every edit schedules a check (POST /api/view) 400 ms later;
// replies that arrive out of order are ignored.
'use strict';

(function () {
  const DEBOUNCE_MS = 400;
  const SUPPORT_TYPES = ['fixed', 'pinned', 'roller', 'free', 'spring', 'guided'];
  const LOAD_TYPES = ['point', 'udl', 'linear', 'couple'];
  const CLAIM_QUANTITIES = ['moment', 'shear', 'reaction', 'reaction_moment', 'deflection', 'rotation',
    'max_moment', 'min_moment', 'max_deflection',
    'moment_max', 'moment_min', 'shear_max', 'shear_min', 'reaction_max', 'reaction_min'];
  // What a claim's place is: a node, x, or a span.
  const CLAIM_PLACES = {
    max_moment: ['span'], min_moment: ['span'], max_deflection: ['span'],
    reaction: ['node'], reaction_moment: ['node'], reaction_max: ['node'], reaction_min: ['node']
  };
  // Fields of the beam file the tables edit; the others are kept as they are.
  const TABLE_FIELDS = ['title', 'units', 'spans', 'supports', 'labels', 'loads', 'stations_per_span',
    'combinations', 'claims', 'deflection_limit'];

  const state = {
    start: null,          // the /api/start reply
    beam: null,           // the beam file being edited (parsed JSON)
    jsonText: null,       // the JSON tab's text when it does not parse, else null
    pristine: null,       // FILE's text as /api/start gave it (its optional "text"), until the first edit
    timer: null,
    seq: 0,               // number of the last request sent
    shown: 0,             // number of the request whose reply is shown
    view: null,           // the last /api/view reply shown
    loadSet: null,        // the load set shown
    dirty: false,
    onResult: []          // callbacks (seq, view) after a reply is shown (the test hook)
  };

  const $ = (id) => document.getElementById(id);

  // ---- JSON Pointer (RFC 6901) ----
  function ptrParts(p) {
    if (p === '') return [];
    return p.slice(1).split('/').map((s) => s.replace(/~1/g, '/').replace(/~0/g, '~'));
  }
  function ptrJoin(parts) {
    return parts.map((s) => '/' + String(s).replace(/~/g, '~0').replace(/\//g, '~1')).join('');
  }
  function getAt(obj, p) {
    let o = obj;
    for (const k of ptrParts(p)) {
      if (o === null || typeof o !== 'object') return undefined;
      o = o[k];
    }
    return o;
  }
  // Sets (value !== undefined) or deletes (undefined) the field at p, making objects on the way.
  function setAt(obj, p, value) {
    const parts = ptrParts(p);
    const last = parts.pop();
    let o = obj;
    for (const k of parts) {
      if (o[k] === null || typeof o[k] !== 'object') {
        if (value === undefined) return;
        o[k] = {};
      }
      o = o[k];
    }
    if (value === undefined) {
      if (Array.isArray(o)) o.splice(Number(last), 1); else delete o[last];
    } else {
      o[last] = value;
    }
  }

  // ---- values typed into a cell ----
  const NUMBER_RE = /^\s*[-+]?(\d+\.?\d*|\.\d+)([eE][-+]?\d+)?\s*$/;
  // A quantity: a plain number, or text with its own unit ("200 GPa"), kept as text
  // for the reader to convert or to refuse with its located error. Blank: no field.
  function quantityOf(text) {
    const t = text.trim();
    if (t === '') return undefined;
    if (NUMBER_RE.test(t)) return Number(t);
    return t;
  }
  function textOf(v) {
    if (v === undefined || v === null) return '';
    if (typeof v === 'object') {
      if (Array.isArray(v) && v.length === 2) return textOf(v[0]) + ' to ' + textOf(v[1]);
      return JSON.stringify(v);
    }
    return String(v);
  }
  function factorOf(text) {
    const t = text.trim();
    if (t === '') return undefined;
    const m = /^(\S+)\s*(?:to|\.\.)\s*(\S+)$/.exec(t);
    if (m && NUMBER_RE.test(m[1]) && NUMBER_RE.test(m[2])) return [Number(m[1]), Number(m[2])];
    return quantityOf(t);
  }
  function nodeRefOf(text) {
    const t = text.trim();
    if (t === '') return undefined;
    if (/^\d+$/.test(t)) return Number(t);
    return t;
  }

  // ---- units ----
  function units() {
    const u = (state.beam && state.beam.units) || {};
    const f = typeof u.force === 'string' ? u.force : 'F';
    const l = typeof u.length === 'string' ? u.length : 'L';
    return {
      force: f, length: l, moment: f + '·' + l, dist: f + '/' + l, ei: f + '·' + l + '²',
      k: f + '/' + l, kr: f + '·' + l + '/rad', rotation: 'rad'
    };
  }
  function claimUnit(q) {
    const u = units();
    if (/moment/.test(q)) return u.moment;
    if (/deflection/.test(q)) return u.length;
    if (q === 'rotation') return 'rad';
    return u.force;
  }

  function defaultLabel(i) {
    let s = '';
    let n = i;
    do { s = String.fromCharCode(65 + (n % 26)) + s; n = Math.floor(n / 26) - 1; } while (n >= 0);
    return s;
  }
  function nodeLabels() {
    const b = state.beam;
    const n = Array.isArray(b.supports) ? b.supports.length : 0;
    const out = [];
    for (let i = 0; i < n; ++i) {
      out.push(Array.isArray(b.labels) && typeof b.labels[i] === 'string' ? b.labels[i] : defaultLabel(i));
    }
    return out;
  }

  // ---- building the tables ----
  function el(tag, attrs, ...kids) {
    const e = document.createElement(tag);
    if (attrs) {
      for (const [k, v] of Object.entries(attrs)) {
        if (v === undefined || v === null || v === false) continue;
        if (k === 'text') e.textContent = v;
        else if (k === 'html') e.innerHTML = v;
        else e.setAttribute(k, v === true ? '' : v);
      }
    }
    for (const k of kids) if (k !== null && k !== undefined) e.append(k);
    return e;
  }
  function th(text, unit) {
    const e = el('th', { scope: 'col' }, text);
    if (unit) e.append(el('span', { class: 'unit', text: ' [' + unit + ']' }));
    return e;
  }
  // A text cell editing the field at pointer p, read with `read` (quantityOf by default).
  function inputCell(p, label, opts) {
    const o = opts || {};
    const v = getAt(state.beam, p);
    const inp = el('input', {
      type: 'text', 'data-pointer': p, 'aria-label': label, value: textOf(v),
      size: o.size || 9, placeholder: o.placeholder || '', disabled: o.disabled
    });
    inp.dataset.kind = o.kind || 'quantity';
    inp.style.width = (0.55 * (o.size || 9) + 0.8).toFixed(1) + 'em';
    const td = el('td', null, inp);
    if (o.unit) td.append(el('span', { class: 'unit', text: ' ' + o.unit }));
    return td;
  }
  function selectCell(p, label, choices, current, kind) {
    const s = el('select', { 'data-pointer': p, 'aria-label': label });
    s.dataset.kind = kind;
    for (const c of choices) {
      const [value, text] = Array.isArray(c) ? c : [c, c];
      s.append(el('option', { value: value, selected: value === current, text: text }));
    }
    if (!choices.some((c) => (Array.isArray(c) ? c[0] : c) === current)) {
      s.prepend(el('option', { value: current, selected: true, text: textOf(current) || '(none)' }));
    }
    return el('td', null, s);
  }
  function removeCell(kind, i, label) {
    return el('td', null, el('button', { type: 'button', class: 'remove', 'data-remove': kind, 'data-index': i,
      'aria-label': label, title: label, text: '×' }));
  }

  function renderSpans() {
    const u = units();
    const t = $('t-spans');
    t.replaceChildren();
    t.append(el('thead', null, el('tr', null, th('span'), th('length', u.length), th('stiffness given as'),
      th('EI', u.ei), th('E', u.force + '/' + u.length + '² or with its unit'), th('I', u.length + '⁴ or with its unit'), th(''))));
    const body = el('tbody');
    const spans = Array.isArray(state.beam.spans) ? state.beam.spans : [];
    spans.forEach((s, i) => {
      const p = '/spans/' + i;
      const hasEI = s && typeof s === 'object' && ('EI' in s || !('E' in s || 'I' in s));
      const tr = el('tr', { 'data-pointer': p },
        el('th', { scope: 'row', text: String(i + 1) }),
        inputCell(p + '/length', 'span ' + (i + 1) + ' length'),
        selectCell(p + '#stiffness', 'span ' + (i + 1) + ' stiffness given as', [['EI', 'EI'], ['E,I', 'E and I']],
          hasEI ? 'EI' : 'E,I', 'stiffness'),
        inputCell(p + '/EI', 'span ' + (i + 1) + ' EI', { disabled: !hasEI, size: 10 }),
        inputCell(p + '/E', 'span ' + (i + 1) + ' E', { disabled: hasEI, placeholder: hasEI ? '' : 'e.g. 200 GPa', size: 10 }),
        inputCell(p + '/I', 'span ' + (i + 1) + ' I', { disabled: hasEI, placeholder: hasEI ? '' : 'e.g. 8.6e7 mm^4', size: 12 }),
        spans.length > 1 ? removeCell('span', i, 'remove span ' + (i + 1)) : el('td'));
      body.append(tr);
    });
    t.append(body);
  }

  function supportField(i, f) { return '/supports/' + i + '/' + f; }
  function renderSupports() {
    const u = units();
    const t = $('t-supports');
    t.replaceChildren();
    t.append(el('thead', null, el('tr', null, th('node'), th('label'), th('type'), th('settlement', u.length),
      th('settlement case'), th('spring k', u.k), th('rotational spring kr', u.kr), th('hinge'))));
    const body = el('tbody');
    const sup = Array.isArray(state.beam.supports) ? state.beam.supports : [];
    const labels = nodeLabels();
    sup.forEach((s, i) => {
      const p = '/supports/' + i;
      const type = typeof s === 'string' ? s : (s && typeof s === 'object' ? s.type : '');
      const obj = s && typeof s === 'object' ? s : {};
      const settlement = obj.settlement;
      const sObj = settlement && typeof settlement === 'object' && !Array.isArray(settlement);
      const canSettle = type !== 'free' && type !== 'guided';
      const interior = i > 0 && i < sup.length - 1;
      const hingeOk = interior && type !== 'fixed' && type !== 'guided';
      const labelInput = el('input', { type: 'text', 'data-pointer': '/labels/' + i, 'aria-label': 'node ' + (i + 1) + ' label',
        value: Array.isArray(state.beam.labels) ? textOf(state.beam.labels[i]) : '', placeholder: labels[i], size: 4 });
      labelInput.dataset.kind = 'label';
      const hinge = el('input', { type: 'checkbox', 'data-pointer': supportField(i, 'hinge'), 'aria-label': 'hinge at node ' + (i + 1),
        checked: obj.hinge === true, disabled: !hingeOk && obj.hinge !== true });
      hinge.dataset.kind = 'hinge';
      const tr = el('tr', { 'data-pointer': p },
        el('th', { scope: 'row', text: String(i + 1) }),
        el('td', null, labelInput),
        selectCell(typeof s === 'string' ? p : p + '/type', 'node ' + (i + 1) + ' support type', SUPPORT_TYPES, type, 'support-type'),
        inputCell(sObj ? supportField(i, 'settlement/value') : supportField(i, 'settlement'), 'node ' + (i + 1) + ' settlement',
          { disabled: !canSettle && settlement === undefined, kind: 'settlement', size: 8 }),
        inputCell(supportField(i, 'settlement/case'), 'node ' + (i + 1) + ' settlement case',
          { disabled: !canSettle && settlement === undefined, kind: 'settlement-case', size: 9, placeholder: 'all sets' }),
        inputCell(supportField(i, 'k'), 'node ' + (i + 1) + ' spring k', { disabled: type !== 'spring', kind: 'support-option', size: 9 }),
        inputCell(supportField(i, 'kr'), 'node ' + (i + 1) + ' rotational spring kr', { disabled: type !== 'spring', kind: 'support-option', size: 9 }),
        el('td', { class: 'center' }, hinge));
      body.append(tr);
    });
    t.append(body);
  }

  function loadMainField(type) { return { point: 'P', udl: 'w', linear: 'w1', couple: 'C' }[type] || 'P'; }
  function renderLoads() {
    const u = units();
    const t = $('t-loads');
    t.replaceChildren();
    t.append(el('thead', null, el('tr', null, th('load'), th('type'), th('on'), th('span or node'),
      th('value'), th('w2', u.dist), th('at or from', u.length), th('to', u.length), th('load case'), th(''))));
    const body = el('tbody');
    const loads = Array.isArray(state.beam.loads) ? state.beam.loads : [];
    loads.forEach((l, i) => {
      const p = '/loads/' + i;
      const o = l && typeof l === 'object' ? l : {};
      const type = o.type;
      const onNode = 'node' in o && !('span' in o);
      const main = loadMainField(type);
      const mainUnit = { P: u.force, w: u.dist, w1: u.dist, C: u.moment }[main];
      const distributed = type === 'udl' || type === 'linear';
      const tr = el('tr', { 'data-pointer': p },
        el('th', { scope: 'row', text: String(i + 1) }),
        selectCell(p + '/type', 'load ' + (i + 1) + ' type', LOAD_TYPES, type, 'load-type'),
        selectCell(p + '#on', 'load ' + (i + 1) + ' on a span or at a node',
          distributed ? [['span', 'span']] : [['span', 'span'], ['node', 'node']], onNode ? 'node' : 'span', 'load-on'),
        inputCell(p + (onNode ? '/node' : '/span'), 'load ' + (i + 1) + (onNode ? ' node' : ' span') + ' number', { kind: 'index', size: 4 }),
        inputCell(p + '/' + main, 'load ' + (i + 1) + ' ' + main, { unit: main + ' [' + mainUnit + ']', size: 7 }),
        inputCell(p + '/w2', 'load ' + (i + 1) + ' w2', { disabled: type !== 'linear', size: 6 }),
        inputCell(p + (distributed ? '/from' : '/at'), 'load ' + (i + 1) + (distributed ? ' from' : ' at'),
          { disabled: onNode, size: 6, placeholder: distributed ? 'start' : '' }),
        inputCell(p + '/to', 'load ' + (i + 1) + ' to', { disabled: !distributed, size: 6, placeholder: distributed ? 'end' : '' }),
        inputCell(p + '/case', 'load ' + (i + 1) + ' load case', { kind: 'text', size: 7, placeholder: 'loads' }),
        removeCell('load', i, 'remove load ' + (i + 1)));
      body.append(tr);
    });
    if (!loads.length) body.append(el('tr', null, el('td', { colspan: 10, class: 'empty', text: 'No loads yet.' })));
    t.append(body);
  }

  // The load cases the beam names (loads' cases, settlement cases, combinations' factors), in order.
  function caseNames() {
    const b = state.beam;
    const names = [];
    const add = (n) => { if (typeof n === 'string' && n !== '' && !names.includes(n)) names.push(n); };
    for (const l of Array.isArray(b.loads) ? b.loads : []) add(l && typeof l === 'object' && 'case' in l ? l.case : 'loads');
    for (const s of Array.isArray(b.supports) ? b.supports : []) {
      if (s && typeof s === 'object' && s.settlement && typeof s.settlement === 'object') add(s.settlement.case);
    }
    for (const m of Array.isArray(b.moving_loads) ? b.moving_loads : []) add(m && m.name);
    for (const c of Array.isArray(b.combinations) ? b.combinations : []) {
      if (c && c.factors && typeof c.factors === 'object') Object.keys(c.factors).forEach(add);
    }
    return names;
  }
  function renderCombinations() {
    const t = $('t-combinations');
    t.replaceChildren();
    const combos = Array.isArray(state.beam.combinations) ? state.beam.combinations : [];
    const cases = caseNames();
    const head = el('tr', null, th('combination'), th('name'));
    for (const c of cases) head.append(th('× ' + c));
    head.append(th('patterned cases'), th('arrangements'), th('deflection limit'), th(''));
    t.append(el('thead', null, head));
    const body = el('tbody');
    combos.forEach((c, i) => {
      const p = '/combinations/' + i;
      const tr = el('tr', { 'data-pointer': p }, el('th', { scope: 'row', text: String(i + 1) }));
      if (c && typeof c === 'object' && 'preset' in c) {
        tr.append(inputCell(p + '/name', 'combination ' + (i + 1) + ' name', { kind: 'text', size: 12 }));
        tr.append(el('td', { colspan: cases.length + 3, class: 'note',
          text: 'preset ' + textOf(c.preset) + ' with ' + (c.cases && typeof c.cases === 'object'
            ? Object.entries(c.cases).map(([k, v]) => k + ' = ' + textOf(v)).join(', ') : textOf(c.cases)) + ' (edit it in the JSON tab)' }));
      } else {
        tr.append(inputCell(p + '/name', 'combination ' + (i + 1) + ' name', { kind: 'text', size: 12 }));
        for (const name of cases) {
          tr.append(inputCell(p + '/factors/' + ptrJoin([name]).slice(1), 'combination ' + (i + 1) + ' factor on ' + name,
            { kind: 'factor', size: 8 }));
        }
        const pat = el('input', { type: 'text', 'data-pointer': p + '/pattern', 'aria-label': 'combination ' + (i + 1) + ' patterned cases',
          value: Array.isArray(c.pattern) ? c.pattern.join(', ') : textOf(c.pattern), size: 12 });
        pat.dataset.kind = 'list';
        tr.append(el('td', null, pat));
        tr.append(selectCell(p + '/arrangements', 'combination ' + (i + 1) + ' arrangements',
          [['', 'all (default)'], ['all', 'all'], ['adjacent-and-alternate', 'adjacent and alternate']],
          c.arrangements === undefined ? '' : c.arrangements, 'arrangements'));
        tr.append(inputCell(p + '/deflection_limit', 'combination ' + (i + 1) + ' deflection limit',
          { kind: 'text', size: 8, placeholder: 'the beam\'s' }));
      }
      tr.append(removeCell('combination', i, 'remove combination ' + (i + 1)));
      body.append(tr);
    });
    if (!combos.length) body.append(el('tr', null, el('td', { colspan: cases.length + 6, class: 'empty', text: 'No combinations: each load case is checked on its own.' })));
    t.append(body);
  }

  function claimPlace(c) {
    if ('span' in c) return 'span';
    if ('x' in c) return 'x';
    return 'node';
  }
  function renderClaims() {
    const u = units();
    const t = $('t-claims');
    t.replaceChildren();
    t.append(el('thead', null, el('tr', null, th('claim'), th('quantity'), th('where'), th('node, x [' + u.length + '] or span'),
      th('side'), th('load case'), th('claimed value'), th('own tolerance'), th(''))));
    const body = el('tbody');
    const claims = state.beam.claims && Array.isArray(state.beam.claims.values) ? state.beam.claims.values : [];
    claims.forEach((c, i) => {
      const p = '/claims/values/' + i;
      const o = c && typeof c === 'object' ? c : {};
      const place = claimPlace(o);
      const places = CLAIM_PLACES[o.quantity] || ['node', 'x'];
      const tr = el('tr', { 'data-pointer': p },
        el('th', { scope: 'row', text: String(i + 1) }),
        selectCell(p + '/quantity', 'claim ' + (i + 1) + ' quantity', CLAIM_QUANTITIES, o.quantity, 'claim-quantity'),
        selectCell(p + '#place', 'claim ' + (i + 1) + ' where', places, place, 'claim-place'),
        inputCell(p + '/' + place, 'claim ' + (i + 1) + ' ' + place, { kind: place === 'x' ? 'quantity' : (place === 'span' ? 'index' : 'node'), size: 6 }),
        selectCell(p + '/side', 'claim ' + (i + 1) + ' side', [['', '—'], ['left', 'left'], ['right', 'right']],
          o.side === undefined ? '' : o.side, 'side'),
        inputCell(p + '/case', 'claim ' + (i + 1) + ' load case', { kind: 'text', size: 9, placeholder: '' }),
        inputCell(p + '/value', 'claim ' + (i + 1) + ' claimed value', { unit: claimUnit(o.quantity || ''), size: 9 }),
        inputCell(p + '/tolerance', 'claim ' + (i + 1) + ' tolerance', { kind: 'tolerance', size: 6, placeholder: '—' }),
        removeCell('claim', i, 'remove claim ' + (i + 1)));
      body.append(tr);
    });
    if (!claims.length) body.append(el('tr', null, el('td', { colspan: 9, class: 'empty', text: 'No claims: add the values of a hand calculation to check them.' })));
    t.append(body);
  }

  function renderGeneral() {
    const b = state.beam;
    $('in-title').value = textOf(b.title);
    const u = b.units && typeof b.units === 'object' ? b.units : {};
    for (const [id, list, cur] of [['in-force', state.start.forces, u.force], ['in-length', state.start.lengths, u.length]]) {
      const s = $(id);
      s.replaceChildren();
      for (const name of list || []) s.append(el('option', { value: name, text: name, selected: name === cur }));
      if (!(list || []).includes(cur)) s.prepend(el('option', { value: textOf(cur), text: textOf(cur) || '(none)', selected: true }));
      s.dataset.kind = 'text';
    }
    $('in-stations').value = textOf(b.stations_per_span);
    $('in-stations').dataset.kind = 'index';
    const lim = $('in-limit');
    lim.dataset.kind = 'text';
    if (b.deflection_limit && typeof b.deflection_limit === 'object') {
      lim.dataset.pointer = '/deflection_limit/span';
      lim.value = textOf(b.deflection_limit.span);
    } else {
      lim.dataset.pointer = '/deflection_limit';
      lim.value = textOf(b.deflection_limit);
    }
    $('in-title').dataset.kind = 'text';
    $('in-tolerance').dataset.kind = 'tolerance';
    $('in-tolerance').value = b.claims && typeof b.claims === 'object' ? textOf(b.claims.tolerance) : '';
    const others = Object.keys(b).filter((k) => !TABLE_FIELDS.includes(k));
    const notes = [];
    if (others.length) notes.push('Also in the file, kept as they are (edit them in the JSON tab): ' + others.join(', ') + '.');
    if (b.deflection_limit && typeof b.deflection_limit === 'object') {
      notes.push('The deflection limit has more parts than its ratio (cantilever, load sets): see the JSON tab.');
    }
    $('other-fields').textContent = notes.join(' ');
  }

  function renderTables() {
    if (!state.beam || typeof state.beam !== 'object' || Array.isArray(state.beam)) return;
    renderGeneral();
    renderSpans();
    renderSupports();
    renderLoads();
    renderCombinations();
    renderClaims();
    markErrors();
  }
  function renderJson() {
    if (state.jsonText !== null) return;
    const ta = $('json-text');
    if (document.activeElement !== ta) ta.value = bodyText();
  }

  // ---- edits ----
  function supportObject(i) {
    const sup = state.beam.supports;
    if (typeof sup[i] === 'string') sup[i] = { type: sup[i] };
    else if (!sup[i] || typeof sup[i] !== 'object') sup[i] = { type: 'pinned' };
    return sup[i];
  }

  // One user edit of the element `e`: changes the beam; returns true when the
  // tables must be drawn again (their shape changed).
  function applyEdit(e) {
    const p = e.dataset.pointer;
    const kind = e.dataset.kind || 'quantity';
    const b = state.beam;
    const value = e.type === 'checkbox' ? e.checked : e.value;
    switch (kind) {
      case 'quantity': setAt(b, p, quantityOf(value)); return false;
      case 'index': setAt(b, p, quantityOf(value)); return false;
      case 'node': setAt(b, p, nodeRefOf(value)); return false;
      case 'tolerance': setAt(b, p, quantityOf(value)); return false;
      case 'factor': setAt(b, p, factorOf(value)); return false;
      case 'text': setAt(b, p, value.trim() === '' ? undefined : value); return p.startsWith('/units');
      case 'list': {
        const items = value.split(',').map((s) => s.trim()).filter((s) => s !== '');
        setAt(b, p, items.length ? items : undefined);
        if (!items.length) setAt(b, p.replace(/\/pattern$/, '/arrangements'), undefined);
        return false;
      }
      case 'arrangements': setAt(b, p, value === '' ? undefined : value); return false;
      case 'side': setAt(b, p, value === '' ? undefined : value); return false;
      case 'label': {
        const i = Number(ptrParts(p)[1]);
        if (!Array.isArray(b.labels)) b.labels = nodeLabels();
        b.labels[i] = value.trim() === '' ? defaultLabel(i) : value.trim();
        return false;
      }
      case 'stiffness': {
        const s = getAt(b, p.replace(/#.*$/, ''));
        if (value === 'EI') {
          delete s.E; delete s.I;
          if (!('EI' in s)) s.EI = '';
        } else {
          delete s.EI;
          if (!('E' in s)) s.E = '';
          if (!('I' in s)) s.I = '';
        }
        for (const k of ['EI', 'E', 'I']) if (s[k] === '') delete s[k];
        return true;
      }
      case 'support-type': {
        const i = Number(ptrParts(p)[1]);
        const cur = b.supports[i];
        if (typeof cur === 'string' && value !== 'spring') { b.supports[i] = value; return true; }
        const o = supportObject(i);
        o.type = value;
        if (value !== 'spring') { delete o.k; delete o.kr; }
        if (value === 'free' || value === 'guided') delete o.settlement;
        if (value === 'fixed' || value === 'guided') delete o.hinge;
        return true;
      }
      case 'settlement': case 'settlement-case': case 'support-option': case 'hinge': {
        const i = Number(ptrParts(p)[1]);
        const o = supportObject(i);
        if (kind === 'hinge') { if (value) o.hinge = true; else delete o.hinge; return false; }
        if (kind === 'support-option') { setAt(b, p, quantityOf(value)); return false; }
        const prev = o.settlement;
        const prevValue = prev && typeof prev === 'object' ? prev.value : prev;
        const prevCase = prev && typeof prev === 'object' ? prev.case : undefined;
        const v = kind === 'settlement' ? quantityOf(value) : prevValue;
        const c = kind === 'settlement-case' ? (value.trim() === '' ? undefined : value.trim()) : prevCase;
        if (c !== undefined) o.settlement = Object.assign(prev && typeof prev === 'object' ? prev : {}, { value: v, case: c });
        else if (v !== undefined) o.settlement = v;
        else delete o.settlement;
        if (o.settlement && typeof o.settlement === 'object' && o.settlement.value === undefined) delete o.settlement.value;
        // The shape (number or {value, case}) may have changed: redraw only then.
        return (prev && typeof prev === 'object') !== (o.settlement !== undefined && typeof o.settlement === 'object');
      }
      case 'load-type': {
        const l = getAt(b, p.replace(/\/type$/, ''));
        const oldMain = l[loadMainField(l.type)];
        for (const k of ['P', 'w', 'w1', 'w2', 'C', 'at', 'from', 'to']) delete l[k];
        l.type = value;
        if (oldMain !== undefined) l[loadMainField(value)] = oldMain;
        if (value === 'linear') l.w2 = oldMain !== undefined ? oldMain : 0;
        if ((value === 'udl' || value === 'linear') && 'node' in l) {
          l.span = Math.max(1, Math.min(Number(l.node) || 1, (b.spans || []).length));
          delete l.node;
        }
        if ((value === 'point' || value === 'couple') && 'span' in l) l.at = 0;
        return true;
      }
      case 'load-on': {
        const l = getAt(b, p.replace(/#.*$/, ''));
        if (value === 'node') { l.node = l.span !== undefined ? l.span : 1; delete l.span; delete l.at; }
        else { l.span = l.node !== undefined ? Math.min(l.node, (b.spans || []).length || 1) : 1; delete l.node; l.at = 0; }
        return true;
      }
      case 'claim-quantity': {
        const c = getAt(b, p.replace(/\/quantity$/, ''));
        c.quantity = value;
        const places = CLAIM_PLACES[value] || ['node', 'x'];
        const cur = claimPlace(c);
        if (!places.includes(cur)) {
          const old = c[cur];
          delete c[cur];
          c[places[0]] = places[0] === 'span' ? 1 : (places[0] === 'node' ? (typeof old === 'string' ? old : nodeLabels()[0] || 1) : 0);
        }
        return true;
      }
      case 'claim-place': {
        const c = getAt(b, p.replace(/#.*$/, ''));
        for (const k of ['node', 'x', 'span']) delete c[k];
        c[value] = value === 'node' ? (nodeLabels()[0] || 1) : (value === 'span' ? 1 : 0);
        return true;
      }
      default:
        return false;   // an unknown kind never edits the beam
    }
  }

  function addRow(what) {
    const b = state.beam;
    if (what === 'span') {
      if (!Array.isArray(b.spans)) b.spans = [];
      const last = b.spans[b.spans.length - 1];
      const s = last && typeof last === 'object' ? JSON.parse(JSON.stringify(last)) : { length: 5, EI: 50000 };
      b.spans.push(s);
      if (!Array.isArray(b.supports)) b.supports = ['pinned'];
      b.supports.push('roller');
      if (Array.isArray(b.labels)) b.labels.push(defaultLabel(b.labels.length));
    } else if (what === 'load') {
      if (!Array.isArray(b.loads)) b.loads = [];
      b.loads.push({ type: 'udl', span: 1, w: 10 });
    } else if (what === 'combination') {
      if (!Array.isArray(b.combinations)) b.combinations = [];
      const factors = {};
      for (const c of caseNames()) factors[c] = 1.0;
      b.combinations.push({ name: 'combination ' + (b.combinations.length + 1), factors: factors });
    } else if (what === 'claim') {
      if (!b.claims || typeof b.claims !== 'object') b.claims = { values: [] };
      if (!Array.isArray(b.claims.values)) b.claims.values = [];
      b.claims.values.push({ quantity: 'reaction', node: nodeLabels()[0] || 1, value: 0 });
    }
  }
  function removeRow(what, i) {
    const b = state.beam;
    if (what === 'span') {
      // The span and the node on its right go; loads on them go; later numbers shift.
      const n = b.spans.length;
      if (n <= 1) return;
      b.spans.splice(i, 1);
      const node = i + 1 < n ? i + 1 : n;   // 0-based index of the node removed
      if (Array.isArray(b.supports)) b.supports.splice(node, 1);
      if (Array.isArray(b.labels)) b.labels.splice(node, 1);
      if (Array.isArray(b.loads)) {
        b.loads = b.loads.filter((l) => !(l && ((l.span === i + 1) || (l.node === node + 1))));
        for (const l of b.loads) {
          if (typeof l.span === 'number' && l.span > i + 1) l.span -= 1;
          if (typeof l.node === 'number' && l.node > node + 1) l.node -= 1;
        }
      }
    } else if (what === 'load') b.loads.splice(i, 1);
    else if (what === 'combination') { b.combinations.splice(i, 1); if (!b.combinations.length) delete b.combinations; }
    else if (what === 'claim') { b.claims.values.splice(i, 1); }
  }

  function edited(redraw) {
    state.dirty = true;
    state.pristine = null;
    state.jsonText = null;
    if (redraw) renderTables();
    renderJson();
    scheduleCheck();
  }

  // ---- the check ----
  function bodyText() {
    if (state.jsonText !== null) return state.jsonText;
    // Until the first edit, FILE's own text when /api/start gives it (so the
    // reports name FILE, not an edited copy).
    if (state.pristine !== null) return state.pristine;
    return JSON.stringify(state.beam, null, 2) + '\n';
  }
  function scheduleCheck() {
    clearTimeout(state.timer);
    $('status-line').textContent = 'checking…';
    state.timer = setTimeout(runCheck, DEBOUNCE_MS);
  }
  async function runCheck() {
    const seq = ++state.seq;
    let view = null;
    let problem = '';
    try {
      const r = await fetch('api/view', { method: 'POST', headers: { 'Content-Type': 'application/json' }, body: bodyText() });
      const text = await r.text();
      try { view = JSON.parse(text); } catch (err) { problem = 'the desk answered ' + r.status + ': ' + text.slice(0, 200); }
      if (view && (!view.report || !Array.isArray(view.report.beams))) { problem = 'the desk answered ' + r.status + ' without a report'; view = null; }
    } catch (err) {
      problem = 'the desk did not answer (' + err.message + '); is trivet desk still running?';
    }
    if (seq <= state.shown) return;   // a later reply is already shown
    state.shown = seq;
    if (!view) {
      $('status-line').textContent = problem;
      return;
    }
    state.view = view;
    $('status-line').textContent = seq === state.seq ? '' : 'checking…';
    showResults();
    for (const f of state.onResult.slice()) f(seq, view);
  }

  // ---- results ----
  function median(values) {
    const v = values.filter((x) => typeof x === 'number' && isFinite(x)).sort((a, b) => a - b);
    if (!v.length) return null;
    const h = Math.floor(v.length / 2);
    return v.length % 2 ? v[h] : (v[h - 1] + v[h]) / 2;
  }
  // Digits for a column: four significant digits of its largest magnitude.
  function decimalsFor(values) {
    const m = Math.max(0, ...values.filter((x) => typeof x === 'number' && isFinite(x)).map(Math.abs));
    if (!(m > 0)) return 1;
    return Math.min(8, Math.max(0, 3 - Math.floor(Math.log10(m))));
  }
  function numCell(v, decimals, tag) {
    const td = el(tag || 'td', { class: 'num' });
    if (typeof v !== 'number' || !isFinite(v)) { td.textContent = v === null || v === undefined ? '–' : String(v); return td; }
    let s = v.toFixed(decimals);
    if (/^-0\.?0*$/.test(s)) s = s.slice(1);
    td.textContent = s;
    td.dataset.value = String(v);
    td.title = String(v);
    return td;
  }
  function table(id, heads, rows, cols) {
    const t = $(id);
    t.replaceChildren();
    const hr = el('tr');
    for (const h of heads) hr.append(Array.isArray(h) ? th(h[0], h[1]) : th(h));
    t.append(el('thead', null, hr));
    const body = el('tbody');
    const dec = cols.map((c, j) => (c === 'num' ? decimalsFor(rows.map((r) => r.cells[j])) : 0));
    for (const r of rows) {
      const tr = el('tr', r.attrs || null);
      r.cells.forEach((v, j) => {
        if (j === 0) tr.append(el('th', { scope: 'row', text: textOf(v) }));
        else if (cols[j] === 'num') tr.append(numCell(v, dec[j]));
        else if (v instanceof Node) tr.append(el('td', null, v));
        else tr.append(el('td', { text: textOf(v) }));
      });
      body.append(tr);
    }
    if (!rows.length) body.append(el('tr', null, el('td', { colspan: heads.length, class: 'empty', text: 'nothing to show' })));
    t.append(body);
  }

  function okMethods(set) {
    const ms = set && set.methods && typeof set.methods === 'object' ? set.methods : {};
    return Object.values(ms).filter((m) => m && m.status === 'ok');
  }
  // The consensus (median of the ok methods) of a node's field.
  function nodeValue(set, i, field) {
    return median(okMethods(set).map((m) => {
      const src = m.envelope && Array.isArray(m.envelope.nodes) && !(Array.isArray(m.nodes) && m.nodes[i] && field in m.nodes[i]) ? m.envelope.nodes : m.nodes;
      return Array.isArray(src) && src[i] ? src[i][field] : null;
    }));
  }

  function showResults() {
    const view = state.view;
    const report = view.report;
    const b = report.beams[0] || {};
    const status = b.status || 'invalid';
    if (typeof report.caution === 'string' && report.caution) $('caution-text').textContent = report.caution;
    const v = $('verdict');
    v.textContent = status;
    v.className = 'verdict v-' + status;
    const s = report.summary || {};
    const words = {
      agree: 'The methods agree' + (b.claims && b.claims.length ? ' and every claim holds' : '') + '.',
      disagree: 'Something does not hold: the methods differ, a claim fails or a deflection limit is exceeded (see below).',
      unconfirmed: 'Only one method could analyse this beam: its results are not confirmed by a second.',
      invalid: 'The beam file cannot be checked as it is: see the errors.'
    };
    const parts = [words[status] || ''];
    if (s.claims_failed) parts.push(s.claims_failed + ' claim' + (s.claims_failed === 1 ? '' : 's') + ' fail.');
    if (s.limits_failed) parts.push(s.limits_failed + ' deflection limit' + (s.limits_failed === 1 ? '' : 's') + ' exceeded.');
    $('verdict-detail').textContent = parts.join(' ');

    showErrors(Array.isArray(b.errors) ? b.errors : []);

    const results = b.results && typeof b.results === 'object' ? b.results : {};
    const names = Object.keys(results);
    if (!names.includes(state.loadSet)) state.loadSet = names[0] || null;
    const sel = $('load-set');
    sel.replaceChildren();
    for (const n of names) sel.append(el('option', { value: n, text: n + ' (' + textOf(results[n].verdict) + ')', selected: n === state.loadSet }));
    $('set-choice').hidden = names.length < 2;
    showLoadSet();
    showClaims(b);
    $('console-text').textContent = typeof view.console === 'string' ? view.console : '';
  }

  function showLoadSet() {
    const view = state.view;
    const b = view.report.beams[0] || {};
    const units = b.units || state.beam.units || {};
    const f = textOf(units.force) || 'F';
    const l = textOf(units.length) || 'L';
    const fl = f + '·' + l;
    const set = state.loadSet && b.results ? b.results[state.loadSet] : null;
    // The results in the units a person reads (kN, kN·m, m, mm for a
    // metric file; kip, kip·ft, ft, in for an imperial one), as the console
    // and the diagrams show them: the server sends each kind's label and
    // its factor from the file's unit.
    const disp = view.display && typeof view.display === 'object' ? view.display : {};
    const U = (kind, fileLabel) => (disp[kind] && typeof disp[kind].factor === 'number'
      ? { label: textOf(disp[kind].label).replace('*', '·'), factor: disp[kind].factor } : { label: fileLabel, factor: 1 });
    const uF = U('force', f), uM = U('moment', fl), uL = U('length', l), uD = U('deflection', l);
    const cv = (v, u) => (typeof v === 'number' && isFinite(v) ? v * u.factor : v);

    // the plot of this load set
    const plotBox = $('plot');
    const plots = Array.isArray(view.plots) ? view.plots : [];
    const plot = plots.find((p) => p.load_set === state.loadSet) || (plots.length === 1 ? plots[0] : null);
    plotBox.innerHTML = plot && typeof plot.svg === 'string' ? plot.svg : '';
    const svg = plotBox.querySelector('svg');
    if (svg) {
      svg.setAttribute('role', 'img');
      svg.setAttribute('aria-label', 'diagrams of load set ' + state.loadSet + ', every method overlaid');
    }

    // the methods
    const ml = $('methods-line');
    ml.replaceChildren();
    if (set) {
      const ms = set.methods || {};
      const bits = Object.keys(ms).map((name) => name + ' ' + ms[name].status + (ms[name].reason ? ' (' + ms[name].reason + ')' : ''));
      ml.append('methods: ' + bits.join(', ') + '.');
      if (set.max_difference) {
        const d = set.max_difference;
        ml.append(el('br'), 'largest difference between methods (of the largest value): ' +
          Object.keys(d).map((k) => k + ' ' + (typeof d[k] === 'number' ? d[k].toExponential(1) : textOf(d[k]))).join(', ') + '.');
      }
      if (set.problem) ml.append(el('br'), textOf(set.problem));
    }

    // the nodes
    const nodeRows = [];
    const ok = okMethods(set);
    const first = ok[0];
    const envelope = first && first.envelope && !(Array.isArray(first.nodes) && first.nodes.length);
    const n = first ? (Array.isArray(first.nodes) && first.nodes.length ? first.nodes.length
      : (first.envelope && Array.isArray(first.envelope.nodes) ? first.envelope.nodes.length : 0)) : 0;
    const labelOf = (i) => {
      const src = first && Array.isArray(first.nodes) && first.nodes[i] ? first.nodes[i]
        : (first && first.envelope && first.envelope.nodes ? first.envelope.nodes[i] : null);
      return src && src.label !== undefined ? src.label : defaultLabel(i);
    };
    if (envelope) {
      for (let i = 0; i < n; ++i) {
        nodeRows.push({ attrs: { id: 'node-' + i, 'data-label': labelOf(i) }, cells: [labelOf(i), cv(nodeValue(set, i, 'x'), uL),
          cv(nodeValue(set, i, 'reaction_max'), uF), cv(nodeValue(set, i, 'reaction_min'), uF)] });
      }
      table('t-nodes', ['node', ['x', uL.label], ['reaction max', uF.label], ['reaction min', uF.label]], nodeRows, ['', 'num', 'num', 'num']);
    } else {
      const fields = ['x', 'moment_left', 'moment_right', 'reaction_force', 'reaction_moment', 'deflection', 'rotation'];
      const fieldUnit = { x: uL, moment_left: uM, moment_right: uM, reaction_force: uF, reaction_moment: uM, deflection: uD };
      for (let i = 0; i < n; ++i) {
        nodeRows.push({ attrs: { id: 'node-' + i, 'data-label': labelOf(i) },
          cells: [labelOf(i)].concat(fields.map((k) => (fieldUnit[k] ? cv(nodeValue(set, i, k), fieldUnit[k]) : nodeValue(set, i, k)))) });
      }
      table('t-nodes', ['node', ['x', uL.label], ['moment left', uM.label], ['moment right', uM.label], ['reaction', uF.label],
        ['reaction moment', uM.label], ['deflection', uD.label], ['rotation', 'rad']], nodeRows, ['', 'num', 'num', 'num', 'num', 'num', 'num', 'num']);
      // The cells carry their field names for readers of the page (and the browser test).
      const rows = $('t-nodes').tBodies[0].rows;
      for (let i = 0; i < nodeRows.length; ++i) {
        for (let j = 1; j < rows[i].cells.length; ++j) rows[i].cells[j].dataset.field = fields[j - 1];
      }
    }

    // the spans
    const spanRows = [];
    const ext = set && Array.isArray(set.span_extremes) ? set.span_extremes : [];
    const limits = set && Array.isArray(set.deflection_limits) ? set.deflection_limits : [];
    const xs = [];
    for (let i = 0; i < n; ++i) xs.push(nodeValue(set, i, 'x'));
    // Sagging or hogging below the rounding of the largest moment is none
    // ("–"), as in the console and the HTML report.
    let mScale = 0;
    for (const e of ext) mScale = Math.max(mScale, Math.abs(Number(e.max_moment) || 0), Math.abs(Number(e.min_moment) || 0));
    const none = 1e-12 * mScale;
    for (const e of ext) {
      const sag = typeof e.max_moment === 'number' && e.max_moment > none;
      const hog = typeof e.min_moment === 'number' && e.min_moment < -none;
      const k = Number(e.span) - 1;
      const length = xs[k + 1] !== undefined && xs[k] !== undefined && xs[k] !== null && xs[k + 1] !== null ? xs[k + 1] - xs[k] : null;
      const d = typeof e.max_deflection === 'number' ? Math.abs(e.max_deflection) : null;
      const ratio = length !== null && d ? Math.round(length / d) : null;
      const lim = limits.find((x) => Number(x.span) === Number(e.span));
      const limitText = lim ? textOf(lim.limit) + (lim.holds ? ': holds' : ': EXCEEDED') : '';
      spanRows.push({ attrs: lim && !lim.holds ? { class: 'fails' } : null, cells: [String(e.span), cv(length, uL),
        sag ? cv(e.max_moment, uM) : '–', sag ? cv(e.max_moment_x, uL) : '', hog ? cv(e.min_moment, uM) : '–', hog ? cv(e.min_moment_x, uL) : '',
        cv(e.max_deflection, uD), cv(e.max_deflection_x, uL), ratio === null ? '–' : 'L/' + ratio, limitText] });
    }
    const heads = ['span', ['length', uL.label], ['largest sagging moment', uM.label], ['at x', uL.label],
      ['largest hogging moment', uM.label], ['at x', uL.label], ['largest deflection', uD.label], ['at x', uL.label], 'span / deflection'];
    const cols = ['', 'num', 'num', 'num', 'num', 'num', 'num', 'num', ''];
    if (limits.length) { heads.push('deflection limit'); cols.push(''); } else for (const r of spanRows) r.cells.pop();
    table('t-span-results', heads, spanRows, cols);
  }

  function showClaims(b) {
    const units = b.units || {};
    const rows = [];
    const claims = Array.isArray(b.claims) ? b.claims : [];
    claims.forEach((c, i) => {
      const where = 'node' in c ? 'node ' + textOf(c.node) : ('x' in c ? 'x = ' + textOf(c.x) : ('span' in c ? 'span ' + textOf(c.span) : ''));
      const unit = /moment/.test(c.quantity) ? textOf(units.force) + '·' + textOf(units.length)
        : (/deflection/.test(c.quantity) ? textOf(units.length) : (c.quantity === 'rotation' ? 'rad' : textOf(units.force)));
      const verdict = el('span', { class: c.holds ? 'holds' : 'fails', text: c.holds ? 'holds' : 'FAILS' });
      rows.push({ attrs: { class: c.holds ? null : 'fails' }, cells: [String(i + 1), textOf(c.quantity) + ' [' + unit + ']', where + (c.side ? ' (' + c.side + ')' : ''),
        textOf(c.case), c.claimed, c.computed, c.difference, c.tolerance, verdict, textOf(c.reason || c.note || c.source || '')] });
    });
    table('t-claim-results', ['claim', 'quantity [unit]', 'where', 'load case', 'claimed', 'computed', 'difference', 'tolerance', 'verdict', 'note'],
      rows, ['', '', '', '', 'num', 'num', 'num', 'num', '', '']);
  }

  // ---- errors, next to their fields ----
  function fieldFor(pointer) {
    let p = pointer;
    for (;;) {
      const all = document.querySelectorAll('#panel-tables [data-pointer], #json-text');
      // The field itself before its row (a support given as a name is both).
      let row = null;
      for (const e of all) {
        if (e.dataset.pointer !== p) continue;
        if (e.tagName !== 'TR') return e;
        if (!row) row = e;
      }
      if (row) return row;
      if (p === '') return null;
      p = p.slice(0, p.lastIndexOf('/'));
    }
  }
  function showErrors(errors) {
    state.errors = errors;
    const list = $('errors');
    list.replaceChildren();
    for (const e of errors) {
      const where = textOf(e.pointer) + (e.where ? ' (' + e.where + ')' : '');
      const li = el('li', null, el('code', { text: where || '(the file)' }), ': ' + textOf(e.reason || e.message));
      li.dataset.pointer = textOf(e.pointer);
      li.tabIndex = 0;
      const go = () => {
        const f = fieldFor(li.dataset.pointer);
        if (!f) return;
        if (f.id === 'json-text') $('tab-json').click();
        f.scrollIntoView({ block: 'center' });
        if (f.focus) f.focus();
      };
      li.addEventListener('click', go);
      li.addEventListener('keydown', (ev) => { if (ev.key === 'Enter') go(); });
      list.append(li);
    }
    $('errors-box').hidden = errors.length === 0;
    markErrors();
  }
  function markErrors() {
    for (const e of document.querySelectorAll('.has-error')) {
      e.classList.remove('has-error');
      e.removeAttribute('aria-invalid');
    }
    for (const e of document.querySelectorAll('.field-error')) e.remove();
    for (const err of state.errors || []) {
      const f = fieldFor(textOf(err.pointer));
      if (!f) continue;
      f.classList.add('has-error');
      f.setAttribute('aria-invalid', 'true');
      const msg = el('div', { class: 'field-error', role: 'note', text: textOf(err.reason || err.message) });
      if (f.tagName === 'TR') {
        const cells = f.cells;
        (cells[cells.length - 1] || f).append(msg);
      } else if (f.tagName === 'TEXTAREA' || f.closest('label')) {
        (f.closest('label') || f).after(msg);
      } else if (f.parentElement) {
        f.parentElement.append(msg);
      }
    }
  }

  // ---- buttons ----
  function fileName(ext) {
    const base = state.start && state.start.file ? state.start.file.replace(/\.json$/i, '')
      : (state.beam && typeof state.beam.title === 'string' && state.beam.title.trim() ? state.beam.title.trim() : 'beam');
    return base.replace(/[^A-Za-z0-9._-]+/g, '-').replace(/^-+|-+$/g, '').slice(0, 80) + ext;
  }
  function download(blob, name) {
    const a = el('a', { href: URL.createObjectURL(blob), download: name });
    document.body.append(a);
    a.click();
    setTimeout(() => { URL.revokeObjectURL(a.href); a.remove(); }, 1000);
  }
  async function save() {
    try {
      const r = await fetch('api/save', { method: 'POST', headers: { 'Content-Type': 'application/json' }, body: bodyText() });
      const t = await r.text();
      let j = null;
      try { j = JSON.parse(t); } catch (err) { j = null; }
      if (r.ok && j && j.saved) {
        state.dirty = false;
        const b = state.view && state.view.report && state.view.report.beams ? state.view.report.beams[0] : null;
        $('status-line').textContent = 'saved to ' + j.saved +
          (b && b.status === 'invalid' ? ' (as it is: the beam is invalid, see the errors)' : '');
      }
      else $('status-line').textContent = 'not saved: ' + (j && (j.error || j.reason) ? (j.error || j.reason) : r.status + ' ' + t.slice(0, 200));
    } catch (err) {
      $('status-line').textContent = 'not saved: the desk did not answer (' + err.message + ')';
    }
  }
  async function downloadReport() {
    try {
      const r = await fetch('api/report.html', { method: 'POST', headers: { 'Content-Type': 'application/json' }, body: bodyText() });
      if (!r.ok) { $('status-line').textContent = 'no report: the desk answered ' + r.status; return; }
      const cd = r.headers.get('Content-Disposition') || '';
      const m = /filename="([^"]+)"/.exec(cd);
      download(await r.blob(), m ? m[1] : fileName('.html'));
    } catch (err) {
      $('status-line').textContent = 'no report: the desk did not answer (' + err.message + ')';
    }
  }
  function newBeam(kind) {
    if (state.dirty && !window.confirm('Replace the beam being edited? Changes not saved or downloaded are lost.')) return;
    if (kind === 'empty') {
      const u = state.beam && state.beam.units && typeof state.beam.units === 'object' ? state.beam.units : { force: 'kN', length: 'm' };
      state.beam = {
        title: 'New beam',
        units: { force: u.force, length: u.length },
        spans: [{ length: 5, EI: 50000 }, { length: 5, EI: 50000 }],
        supports: ['pinned', 'roller', 'roller'],
        loads: []
      };
    } else {
      state.beam = JSON.parse(JSON.stringify(state.start.beam));
    }
    state.jsonText = null;
    state.pristine = null;
    state.errors = [];
    renderTables();
    $('json-text').value = JSON.stringify(state.beam, null, 2) + '\n';
    scheduleCheck();
    state.dirty = kind === 'empty';
  }

  // ---- wiring ----
  function wire() {
    const tables = $('panel-tables');
    const isBeam = () => state.beam !== null && typeof state.beam === 'object' && !Array.isArray(state.beam);
    const onEdit = (ev) => {
      const e = ev.target;
      if (!isBeam()) return;   // the JSON tab holds something that is not a beam object
      if (!e.dataset || e.dataset.pointer === undefined || e.id === 'json-text') return;
      if (e.tagName === 'SELECT' && ev.type === 'input') return;   // selects act on change
      if (e.tagName !== 'SELECT' && e.type !== 'checkbox' && ev.type === 'change') {
        // A load case typed in full: the combinations' columns follow the cases.
        if (/\/case$/.test(e.dataset.pointer)) { renderCombinations(); markErrors(); }
        return;
      }
      const redraw = applyEdit(e);
      edited(redraw);
    };
    tables.addEventListener('input', onEdit);
    tables.addEventListener('change', onEdit);
    tables.addEventListener('click', (ev) => {
      const t = ev.target;
      if (!isBeam()) return;
      if (t.dataset && t.dataset.add) { addRow(t.dataset.add); edited(true); }
      if (t.dataset && t.dataset.remove) { removeRow(t.dataset.remove, Number(t.dataset.index)); edited(true); }
    });
    $('json-text').addEventListener('input', () => {
      const text = $('json-text').value;
      try {
        const parsed = JSON.parse(text);
        state.beam = parsed;
        state.jsonText = null;
        $('json-state').textContent = '';
        renderTables();
      } catch (err) {
        state.jsonText = text;
        $('json-state').textContent = 'not JSON yet: ' + err.message;
      }
      state.dirty = true;
      state.pristine = null;
      scheduleCheck();
    });
    for (const [tab, panel] of [['tab-tables', 'panel-tables'], ['tab-json', 'panel-json']]) {
      $(tab).addEventListener('click', () => {
        for (const [t2, p2] of [['tab-tables', 'panel-tables'], ['tab-json', 'panel-json']]) {
          $(t2).setAttribute('aria-selected', String(t2 === tab));
          $(p2).hidden = p2 !== panel;
        }
        if (panel === 'panel-json' && state.jsonText === null) $('json-text').value = bodyText();
      });
    }
    $('load-set').addEventListener('change', () => { state.loadSet = $('load-set').value; showLoadSet(); });
    $('btn-save').addEventListener('click', save);
    $('btn-download').addEventListener('click', () => download(new Blob([bodyText()], { type: 'application/json' }), fileName('.json')));
    $('btn-report').addEventListener('click', downloadReport);
    $('new-beam').addEventListener('change', () => { const k = $('new-beam').value; $('new-beam').value = ''; if (k) newBeam(k); });
    window.addEventListener('beforeunload', (ev) => { if (state.dirty) { ev.preventDefault(); ev.returnValue = ''; } });
  }

  // ---- the test hook: #test-edit ----
  // After the first result, change span 1's length through the same path as a
  // user's edit (its input and an `input` event), wait for the new result and
  // write both verdicts and values of the first two nodes into the element #test-log.
  function testHook() {
    if (location.hash !== '#test-edit') return;
    const log = [];
    const snapshot = (tag, view) => {
      const b = view.report.beams[0] || {};
      log.push(tag + '-verdict: ' + (b.status || ''));
      const set = b.results ? b.results[Object.keys(b.results)[0]] : null;
      log.push(tag + '-reaction-node1: ' + nodeValue(set, 0, 'reaction_force'));
      log.push(tag + '-moment-node2-left: ' + nodeValue(set, 1, 'moment_left'));
    };
    let editSeq = null;
    const onResult = (seq, view) => {
      if (editSeq === null) {
        snapshot('first', view);
        const inp = document.querySelector('input[data-pointer="/spans/0/length"]');
        if (!inp) { log.push('error: no span 1 length input'); finish(); return; }
        const old = Number(inp.value);
        const next = Number((old * 1.25).toPrecision(6));
        inp.value = String(next);
        inp.dispatchEvent(new Event('input', { bubbles: true }));
        log.push('edit: /spans/0/length ' + next);
        editSeq = state.seq + 1;   // the request the edit will send
      } else if (seq >= editSeq) {
        snapshot('second', view);
        finish();
      }
    };
    const finish = () => {
      state.onResult = state.onResult.filter((f) => f !== onResult);
      const pre = $('test-log');
      pre.textContent = log.join('\n') + '\ndone\n';
      pre.hidden = false;
    };
    state.onResult.push(onResult);
  }

  async function main() {
    wire();
    testHook();
    try {
      const r = await fetch('api/start');
      state.start = await r.json();
    } catch (err) {
      $('status-line').textContent = 'the desk did not answer /api/start (' + err.message + '); start it with `trivet desk`';
      return;
    }
    state.beam = JSON.parse(JSON.stringify(state.start.beam || {}));
    state.pristine = typeof state.start.text === 'string' ? state.start.text : null;
    $('file-name').textContent = state.start.file ? state.start.file : '(a new beam: Download it to keep it)';
    $('btn-save').disabled = !state.start.writable;
    if (!state.start.writable) $('btn-save').title = 'The desk was started without a file to save to: use Download';
    renderTables();
    renderJson();
    document.body.dataset.ready = 'yes';
    scheduleCheck();
  }

  if (document.readyState === 'loading') document.addEventListener('DOMContentLoaded', main);
  else main();
}());
