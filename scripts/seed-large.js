// Seed a large invented dataset for scale checks: 1,000 members (20 reviewers), 10,000 builds,
// 100,000 steps, 50,000 parts lines, 200,000 comments, reviews, derived builds and revisions, and spec
// blocks on the builds that would have them (amplifiers, supplies; about 3,400 at 10,000 builds) so the
// find-by-numbers index (published_figure, published_part) is filled as on a real site.
// Everything is generated inside PostgreSQL (INSERT … SELECT over generate_series), so it runs in
// well under a minute. Deterministic: the same numbers give the same rows.
//
//   DATABASE_URL=postgres://… node scripts/seed-large.js [--reset] [--builds N]
//
// Rows are recognisable (members' e-mails end in @large.test, build slugs start with "lg-"); --reset
// removes a previous large seed first (members cascade to their builds, steps, comments, …).
import postgres from 'postgres';
import { drizzle } from 'drizzle-orm/postgres-js';
import { loadAppModule } from './lib/app-module.js';

const url = process.env.DATABASE_URL;
if (!url) {
	console.error('DATABASE_URL is not set');
	process.exit(1);
}
const arg = (name, d) => {
	const i = process.argv.indexOf(`--${name}`);
	return i > 0 ? process.argv[i + 1] : d;
};
const reset = process.argv.includes('--reset');
const BUILDS = Number(arg('builds', 10_000));
const MEMBERS = Math.max(50, Math.round(BUILDS / 10));
const REVIEWERS = 20;
const STEPS_PER_BUILD = 10;
const PARTS_PER_BUILD = 5;
const COMMENTS_TOP = Math.round(BUILDS * 18);
const COMMENTS_REPLIES = Math.round(BUILDS * 2);
if (!Number.isInteger(BUILDS) || BUILDS < 100) throw new Error('--builds takes a whole number ≥ 100');

const sql = postgres(url, { max: 1, onnotice: () => {} });

/** A pseudo-random pick from a SQL array literal, keyed on an integer expression and a salt. */
const pick = (words, key, salt) =>
	`(array[${words.map((w) => `'${w.replaceAll("'", "''")}'`).join(',')}])[1 + mod(abs(hashint4((${key}) * 31 + ${salt})), ${words.length})]`;
/** 0 ≤ r < m, pseudo-random from an integer expression and a salt. */
const rnd = (key, salt, m) => `mod(abs(hashint4((${key}) * 17 + ${salt})), ${m})`;

const FIRST = ['Aster', 'Brin', 'Cael', 'Dorea', 'Elko', 'Fenna', 'Garo', 'Hesper', 'Ilvo', 'Jessa', 'Korin', 'Lumi', 'Mirel', 'Noor', 'Orsa', 'Pell', 'Quen', 'Riva', 'Savo', 'Tamsin', 'Ulric', 'Vesna', 'Wren', 'Yaro', 'Zelie'];
const LAST = ['Ambergate', 'Brookholm', 'Coldwater', 'Dunmere', 'Elmsworth', 'Fallowby', 'Greystone', 'Hartwell', 'Ivybridge', 'Juniper', 'Kestrelow', 'Larchmont', 'Millbeck', 'Northrop', 'Oakhurst', 'Pinfold', 'Quarrie', 'Redfern', 'Saltmarsh', 'Thornby'];
const ADJ = ['Compact', 'Quiet', 'Bench', 'Dual-mono', 'Stereo', 'Bridged', 'Low-noise', 'Portable', 'Desktop', 'Rack', 'Tiny', 'Second', 'Simple', 'Balanced', 'Warm'];
const THING = {
	'power-amp': ['chip amp', 'power amp', 'monoblock', 'amp board', 'class AB amp'],
	preamp: ['line preamp', 'phono stage', 'passive preamp', 'tone stage', 'buffer'],
	'headphone-amp': ['headphone amp', 'headphone buffer', 'desk amp'],
	dac: ['DAC', 'DAC output stage', 'I/V stage'],
	'power-supply': ['linear supply', 'dual-rail supply', 'regulated supply', 'soft-start supply'],
	crossover: ['two-way crossover', 'three-way crossover', 'Zobel and notch board'],
	'test-gear': ['dummy load', 'distortion analyser front end', 'current-limited bulb tester', 'signal generator'],
	other: ['speaker protection board', 'volume controller', 'input selector']
};
const CATEGORIES = Object.keys(THING);
const TOPOLOGY = {
	'power-amp': ['class-ab-chip', 'class-ab-discrete', 'class-a', 'class-d'],
	preamp: ['class-a', 'valve', 'passive', 'other'],
	'headphone-amp': ['class-a', 'class-ab-discrete', 'class-ab-chip'],
	dac: ['other', 'class-a'],
	'power-supply': ['other'],
	crossover: ['passive'],
	'test-gear': ['other'],
	other: ['other', 'passive']
};
const RAILS = ['±12', '±15', '±18', '±22', '±25', '±28', '±30', '±35', '+24', '+48'];
const CHASSIS = ['a folded aluminium case', 'a steel enclosure', 'a walnut box', 'a recycled instrument case', 'an open frame', 'a plastic project box'];
const STEP_TITLES = ['Planning the rails', 'Ordering parts', 'Populating the board', 'Winding up the supply', 'Heatsink and mounting', 'Chassis wiring', 'Protective earth and fuse', 'First power-up', 'Measuring', 'Listening notes', 'Fixing a hum', 'Final assembly'];
const SENTENCES = [
	'The reservoir capacitors sit right next to the output devices to keep the high-current loop small.',
	'A current-limited bulb tester caught a solder bridge before anything got hot.',
	'I bonded protective earth to the chassis with a star washer next to the mains inlet.',
	'The heatsink runs warm to the touch after an hour at a third of full power.',
	'DC offset settled under ten millivolts on both channels after warm-up.',
	'A Zobel network of 10 ohms and 100 nF tames the oscillation seen on the scope.',
	'The toroid is mounted with a rubber pad and a single bolt, never a shorted turn through the chassis.',
	'Bleeder resistors drain the rails within a few seconds of switch-off.',
	'Ground returns meet at one star point beside the reservoir.',
	'I swapped the input capacitor for a film part and the hum floor dropped.',
	'The soft start relay bypasses the thermistor after two seconds.',
	'Bias was set with the lid on, after thirty minutes of warm-up.',
	'Ripple measured under 200 mV peak to peak at full load.',
	'The feedback resistors set a gain of about 26 dB.',
	'A slow-blow primary fuse protects the transformer on switch-on surge.',
	'Insulating pads under the tabs keep the rail off the grounded heatsink.',
	'Speaker protection waits for the offset to settle before the relay closes.',
	'The volume pot is a log taper with a 10 k track.'
];
const PART_KINDS = [
	['resistor', ['4k7', '22k', '1k', '10R', '2R2', '680R', '100k', '47k'], 'ohm'],
	['capacitor', ['100n', '0.47u', '4700u', '22u', '1u', '220p', '10000u'], 'F'],
	['diode', ['bridge 35 A', 'fast recovery 3 A', 'small signal'], null],
	['ic', ['5-pin monolithic power amplifier IC', 'dual op-amp', 'TO-220 regulator'], null],
	['transformer', ['toroid 2 × 22 V 160 VA', 'toroid 2 × 18 V 80 VA', 'EI 2 × 12 V 30 VA'], null]
];
const COMMENT_TEXT = [
	'Nice layout. What did you use for the star ground point?',
	'How warm does the heatsink get after an hour?',
	'Thanks for posting the measurements, very helpful.',
	'I built the same board and got a little hum until I moved the input ground.',
	'Did you consider a soft start for that toroid?',
	'Which insulator did you use under the tabs?',
	'The photos of the wiring are really clear.',
	'What DC offset did you see before the speaker relay closed?'
];

const t0 = Date.now();
// Spec blocks as the app's own checks compute them, parts values as its parser reads them (scripts/lib/large-seed.ts).
const app = await loadAppModule('scripts/lib/large-seed.ts');
const variants = app.specBlockVariants();
const jsonLit = (v) => `'${JSON.stringify(v).replaceAll("'", "''")}'::jsonb`;
const variantRows = (list) =>
	list.map((b, i) => `(${i}, '${b.kind}', '${b.title.replaceAll("'", "''")}', ${jsonLit(b.data)}, ${jsonLit(b.derived)}, ${jsonLit(b.checks)})`).join(',\n');
const partValues = PART_KINDS.flatMap(([kind, values]) =>
	values.map((v) => [kind, v, app.partValueSI(v, kind)]).filter(([, , si]) => si !== null)
);

try {
	const [{ n: existing }] = await sql`select count(*)::int as n from "user" where email like '%@large.test'`;
	if (existing > 0 && !reset) {
		console.log(`A large seed is already there (${existing} members). Run with --reset to replace it.`);
		process.exit(0);
	}
	console.log(`Seeding ${BUILDS.toLocaleString('en')} builds into ${new URL(url).pathname.slice(1)} …`);
	await sql.begin(async (tx) => {
		if (existing > 0) {
			await tx.unsafe(`delete from "user" where email like '%@large.test'`);
			console.log('  removed the previous large seed');
		}
	});

	await sql.begin(async (tx) => {
		// Bulk load with the tables' triggers off (this transaction only): they keep caches' versions and the
		// review desk current row by row, which for fresh rows is the defaults plus the two refreshes at the end.
		// (Needs a superuser, as the local PostgreSQL of npm start is; elsewhere the triggers stay on: slower, same rows.)
		await tx
			.savepoint((sp) => sp.unsafe('set local session_replication_role = replica'))
			.catch(() => console.log('  triggers stay on (not a superuser): slower, same rows'));
		const run = async (label, text) => {
			const t = Date.now();
			const r = await tx.unsafe(text);
			console.log(`  ${label.padEnd(34)} ${String(r.count ?? '').padStart(7)} rows  ${((Date.now() - t) / 1000).toFixed(1)} s`);
		};

		await run(
			'members',
			`insert into "user" (id, name, email, email_verified, role, handle, bio, created_at, updated_at)
			 select 'lg-user-' || n,
			        ${pick(FIRST, 'n', 1)} || ' ' || ${pick(LAST, 'n', 2)},
			        'lg' || n || '@large.test', true,
			        case when n <= ${REVIEWERS} then 'reviewer' else 'maker' end,
			        'lg-' || n,
			        'Builds ' || ${pick(['chip amps', 'supplies', 'headphone amps', 'crossovers', 'test gear', 'preamps'], 'n', 3)} || ' in a small workshop.',
			        now() - interval '1100 days', now()
			 from generate_series(1, ${MEMBERS}) n`
		);

		// Builds: ~95 % published (spread over three years, newest = n = 1), the rest drafts.
		const cat = `(array[${CATEGORIES.map((c) => `'${c}'`).join(',')}])[1 + ${rnd('n', 4, CATEGORIES.length)}]`;
		await run(
			'builds',
			`insert into build (id, slug, owner_id, title, summary, category, topology, mains_powered, status, revision,
			                    derived_from_id, review_requested_at, published_at, created_at, updated_at)
			 select md5('lg-build-' || n)::uuid,
			        'lg-' || n || '-' || lower(replace(${pick(ADJ, 'n', 5)}, ' ', '-')),
			        'lg-user-' || (1 + ${rnd('n', 6, MEMBERS)}),
			        ${pick(ADJ, 'n', 5)} || ' ' || thing || ' on ' || ${pick(RAILS, 'n', 7)} || ' V rails (no. ' || n || ')',
			        'A ' || lower(${pick(ADJ, 'n', 5)}) || ' ' || thing || ' in ' || ${pick(CHASSIS, 'n', 8)} || '. ' || ${pick(SENTENCES, 'n', 9)},
			        category,
			        topology,
			        category not in ('crossover', 'test-gear') and ${rnd('n', 10, 10)} < 8,
			        case when ${rnd('n', 11, 20)} = 0 then 'draft' else 'published' end,
			        case when ${rnd('n', 11, 20)} = 0 then 0 else 1 + ${rnd('n', 12, 4)} end,
			        case when n + 151 <= ${BUILDS} and ${rnd('n', 13, 10)} = 0 then md5('lg-build-' || (n + 1 + ${rnd('n', 14, 150)}))::uuid end,
			        case when ${rnd('n', 15, 12)} = 0 then now() - (n * interval '150 minutes') + interval '3 days' end,
			        case when ${rnd('n', 11, 20)} = 0 then null else now() - (n * interval '150 minutes') - (${rnd('n', 16, 3600000)} * interval '1 microsecond') end,
			        now() - (n * interval '150 minutes') - interval '5 days',
			        now() - (n * interval '150 minutes')
			 from (
			   select n, c as category,
			          (case c ${CATEGORIES.map((c) => `when '${c}' then array[${THING[c].map((t) => `'${t}'`).join(',')}]`).join(' ')} end) as things,
			          (case c ${CATEGORIES.map((c) => `when '${c}' then array[${TOPOLOGY[c].map((t) => `'${t}'`).join(',')}]`).join(' ')} end) as topologies
			   from (select n, ${cat} as c from generate_series(1, ${BUILDS}) n) s
			 ) x,
			 lateral (select things[1 + ${rnd('n', 17, 5)} % array_length(things, 1)] as thing,
			                 topologies[1 + ${rnd('n', 18, 4)} % array_length(topologies, 1)] as topology) y`
		);

		await run(
			'steps',
			`insert into build_step (build_id, position, title, body_md, body_html, created_at, updated_at)
			 select md5('lg-build-' || n)::uuid, p,
			        ${pick(STEP_TITLES, 'n * 13 + p', 19)},
			        s1 || ' ' || s2 || E'\n\n' || s3,
			        '<p>' || s1 || ' ' || s2 || '</p>' || E'\n' || '<p>' || s3 || '</p>',
			        now() - (n * interval '150 minutes') - interval '4 days', now() - (n * interval '150 minutes')
			 from generate_series(1, ${BUILDS}) n, generate_series(0, ${STEPS_PER_BUILD - 1}) p,
			      lateral (select ${pick(SENTENCES, 'n * 7 + p', 20)} as s1, ${pick(SENTENCES, 'n * 11 + p', 21)} as s2,
			                      ${pick(SENTENCES, 'n * 5 + p', 22)} as s3) t`
		);

		const kinds = PART_KINDS.map((k) => `'${k[0]}'`).join(',');
		const valueCase = PART_KINDS.map(
			(k, i) => `when ${i} then (array[${k[1].map((v) => `'${v}'`).join(',')}])[1 + ${rnd('n * 9 + p', 23, k[1].length)}]`
		).join(' ');
		await run(
			'parts lines',
			`insert into part_line (build_id, position, designators, quantity, kind, value_text, value, unit, rating_v, package, notes,
			                        design_value_text, substitution_reason)
			 select md5('lg-build-' || n)::uuid, p,
			        (array['R','C','D','U','T'])[k + 1] || (1 + p) || case when k < 2 then ', ' || (array['R','C','D','U','T'])[k + 1] || (11 + p) else '' end,
			        1 + ${rnd('n * 3 + p', 24, 4)},
			        (array[${kinds}])[k + 1],
			        case k ${valueCase} end,
			        null, (array['ohm','F',null,null,null])[k + 1],
			        case when k = 1 then (array[16, 25, 35, 50, 63])[1 + ${rnd('n + p', 25, 5)}] end,
			        (array['axial', 'radial', 'TO-220', 'DIP-8', 'chassis'])[k + 1],
			        case when ${rnd('n + p', 26, 6)} = 0 then 'from the drawer' else '' end,
			        case when k = 0 and ${rnd('n + p', 27, 8)} = 0 then '4k7' end,
			        case when k = 0 and ${rnd('n + p', 27, 8)} = 0 then 'had it on hand' end
			 from generate_series(1, ${BUILDS}) n, generate_series(0, ${PARTS_PER_BUILD - 1}) p,
			      lateral (select mod(p + n, 5) as k) kk`
		);

		await run(
			'parts values (SI)',
			`update part_line p set value = v.si
			 from (values ${partValues.map(([k, t, si]) => `('${k}', '${t}', ${si}::float8)`).join(', ')}) v(kind, txt, si)
			 where p.kind = v.kind and p.value_text = v.txt and p.build_id in (select md5('lg-build-' || n)::uuid from generate_series(1, ${BUILDS}) n)`
		);

		// Spec blocks where a real site has them: most power amps carry an amplifier block and many a
		// supply block, headphone amps an amplifier block, supplies a supply block, some preamps a supply.
		await run(
			'spec blocks',
			`with amp(i, kind, title, data, derived, checks) as (values ${variantRows(variants.amplifier)}),
			      sup(i, kind, title, data, derived, checks) as (values ${variantRows(variants.supply)}),
			      b as (select id, category, hashtext(id::text) as h from build
			            where id in (select md5('lg-build-' || n)::uuid from generate_series(1, ${BUILDS}) n))
			 insert into spec_block (build_id, kind, title, data, derived, checks, position, created_at, updated_at)
			 select b.id, amp.kind, amp.title, amp.data, amp.derived, amp.checks, 0, now(), now()
			 from b join amp on amp.i = mod(abs(b.h), ${variants.amplifier.length})
			 where (b.category = 'power-amp' and mod(abs(b.h / 7), 10) < 7) or (b.category = 'headphone-amp' and mod(abs(b.h / 7), 10) < 5)
			 union all
			 select b.id, sup.kind, sup.title, sup.data, sup.derived, sup.checks, 1, now(), now()
			 from b join sup on sup.i = mod(abs(b.h / 3), ${variants.supply.length})
			 where (b.category = 'power-amp' and mod(abs(b.h / 11), 10) < 5) or (b.category = 'power-supply' and mod(abs(b.h / 11), 10) < 8)
			    or (b.category = 'preamp' and mod(abs(b.h / 11), 10) < 2)`
		);

		await run(
			'comments',
			`insert into comment (build_id, author_id, body_md, body_html, created_at)
			 select md5('lg-build-' || (1 + mod(i, ${BUILDS})))::uuid,
			        'lg-user-' || (1 + ${rnd('i', 28, MEMBERS)}),
			        t, '<p>' || t || '</p>',
			        now() - ((1 + mod(i, ${BUILDS})) * interval '150 minutes') + (${rnd('i', 29, 100000)} * interval '1 second')
			 from generate_series(0, ${COMMENTS_TOP - 1}) i, lateral (select ${pick(COMMENT_TEXT, 'i', 30)} as t) x`
		);
		await run(
			'comment replies',
			`insert into comment (build_id, author_id, parent_id, body_md, body_html, created_at)
			 select c.build_id, 'lg-user-' || (1 + ${rnd('c.rn', 31, MEMBERS)}), c.id, 'Good question. ' || c.body_md, '<p>Good question.</p>', c.created_at + interval '2 hours'
			 from (select id, build_id, body_md, created_at, row_number() over (order by id)::int as rn
			       from comment where build_id in (select md5('lg-build-' || n)::uuid from generate_series(1, ${BUILDS}) n)) c
			 where c.rn <= ${COMMENTS_REPLIES}`
		);

		// Fresh statistics, so the planner hashes the big joins below instead of looping over them.
		await run('analyze', 'analyze "user", build, build_step, part_line, comment');

		await run(
			'reviews',
			`insert into review (build_id, reviewer_id, revision, verdict, summary_md, summary_html, created_at)
			 select b.id, 'lg-user-' || (1 + ${rnd('n', 32, REVIEWERS)}),
			        greatest(1, b.revision - ${rnd('n', 33, 2)}),
			        case when ${rnd('n', 34, 10)} < 7 then 'safe' else 'rework' end,
			        'Looked over the mains wiring, fusing and heatsinking.', '<p>Looked over the mains wiring, fusing and heatsinking.</p>',
			        least(now() - interval '1 minute', b.published_at + (1 + ${rnd('n', 35, 20)}) * interval '1 day')
			 from generate_series(1, ${BUILDS}) n join build b on b.id = md5('lg-build-' || n)::uuid
			 where b.status = 'published' and ${rnd('n', 36, 10)} < 3 and b.owner_id <> 'lg-user-' || (1 + ${rnd('n', 32, REVIEWERS)})`
		);

		await run('analyze', 'analyze review');
		await run(
			'derived counts, review times',
			`update build b set derived_count = coalesce(d.n, 0),
			        last_reviewed_at = r.at
			 from (select md5('lg-build-' || n)::uuid as id from generate_series(1, ${BUILDS}) n) ids
			 left join (select derived_from_id, count(*)::int as n from build where derived_from_id is not null group by 1) d on d.derived_from_id = ids.id
			 left join (select build_id, max(created_at) as at from review group by 1) r on r.build_id = ids.id
			 where b.id = ids.id`
		);

		// Search text as the app keeps it: step titles and text, then parts-list values and notes.
		await run(
			'search text',
			`update build b set search_text = left(coalesce(s.t, '') || E'\n' || coalesce(p.t, ''), 200000)
			 from (select md5('lg-build-' || n)::uuid as id from generate_series(1, ${BUILDS}) n) ids
			 left join (select build_id, string_agg(title || E'\n' || body_md, E'\n' order by position) as t from build_step group by 1) s on s.build_id = ids.id
			 left join (select build_id, string_agg(concat_ws(' ', designators, kind, value_text, design_value_text, package, notes, substitution_reason), E'\n' order by position) as t
			            from part_line group by 1) p on p.build_id = ids.id
			 where b.id = ids.id`
		);

		await run(
			'revisions (current)',
			`insert into build_revision (build_id, number, author_id, summary, snapshot, created_at)
			 select b.id, b.revision, b.owner_id, 'Published as r' || b.revision,
			        jsonb_build_object('version', 1,
			          'build', jsonb_build_object('title', b.title, 'summary', b.summary, 'category', b.category, 'topology', b.topology,
			                                      'mainsPowered', b.mains_powered, 'licence', b.licence, 'coverPhotoId', null),
			          'steps', coalesce((select jsonb_agg(jsonb_build_object('id', s.id, 'title', s.title, 'bodyMd', s.body_md, 'bodyHtml', s.body_html, 'photoIds', '[]'::jsonb) order by s.position)
			                             from build_step s where s.build_id = b.id), '[]'::jsonb),
			          'specBlocks', coalesce((select jsonb_agg(jsonb_build_object('id', s.id, 'kind', s.kind, 'title', s.title, 'data', s.data, 'derived', s.derived,
			                                    'checks', s.checks) order by s.position)
			                             from spec_block s where s.build_id = b.id), '[]'::jsonb),
			          'parts', coalesce((select jsonb_agg(jsonb_build_object('id', p.id, 'designators', p.designators, 'quantity', p.quantity, 'kind', p.kind,
			                                    'valueText', p.value_text, 'value', p.value, 'unit', p.unit, 'tolerancePct', p.tolerance_pct, 'ratingV', p.rating_v,
			                                    'ratingW', p.rating_w, 'package', p.package, 'notes', p.notes, 'designValueText', p.design_value_text,
			                                    'designValue', p.design_value, 'substitutionReason', p.substitution_reason, 'deviationPct', p.deviation_pct,
			                                    'checks', p.checks) order by p.position)
			                             from part_line p where p.build_id = b.id), '[]'::jsonb)),
			        b.published_at
			 from build b where b.slug like 'lg-%' and b.status = 'published'`
		);

		// What the triggers would have kept: the review desk's rows, and the reader version (the lists changed).
		await run('review desk rows', `select review_request_sync(id) from build where slug like 'lg-%' and review_requested_at is not null`);
		await run('reader version', `update reader_version set version = version + 1, changed_at = clock_timestamp() where id = 1`);
	});
	// The find index from the revisions just written, by the app's own refresh (as the revision transaction does).
	const tf = Date.now();
	await drizzle(sql).transaction((tx) => app.refreshFindIndex(tx, null));
	const [f] = await sql`select (select count(*)::int from published_figure) as figures, (select count(*)::int from published_part) as parts`;
	console.log(`  ${'find index'.padEnd(34)} ${String(f.figures + f.parts).padStart(7)} rows  ${((Date.now() - tf) / 1000).toFixed(1)} s (${f.figures} figures, ${f.parts} parts)`);
	await sql.unsafe('analyze');
	const [c] = await sql`select
		(select count(*)::int from build where slug like 'lg-%') as builds,
		(select count(*)::int from build_step s join build b on b.id = s.build_id where b.slug like 'lg-%') as steps,
		(select count(*)::int from part_line p join build b on b.id = p.build_id where b.slug like 'lg-%') as parts,
		(select count(*)::int from comment c join build b on b.id = c.build_id where b.slug like 'lg-%') as comments,
		(select count(*)::int from review r join build b on b.id = r.build_id where b.slug like 'lg-%') as reviews,
		(select count(*)::int from spec_block s join build b on b.id = s.build_id where b.slug like 'lg-%') as blocks`;
	console.log(
		`Done in ${((Date.now() - t0) / 1000).toFixed(1)} s: ${c.builds} builds, ${c.steps} steps, ${c.parts} parts lines, ${c.comments} comments, ${c.reviews} reviews, ${c.blocks} spec blocks.`
	);
} finally {
	await sql.end({ timeout: 5 });
}
