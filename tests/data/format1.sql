BEGIN TRANSACTION;
CREATE TABLE calibrations (
    id         INTEGER PRIMARY KEY,
    created    TEXT NOT NULL,
    labels     TEXT NOT NULL,       -- the labels file it was computed from
    thresholds TEXT NOT NULL,       -- JSON: {"support": 0.42, "weak_margin": 0.05, ...}
    metrics    TEXT NOT NULL DEFAULT '{}'
);
CREATE TABLE documents (
    id              INTEGER PRIMARY KEY,
    path            TEXT NOT NULL UNIQUE,
    source_root     TEXT NOT NULL,
    kind            TEXT NOT NULL,          -- pdf | html | markdown | text
    sha256          TEXT NOT NULL,
    size            INTEGER NOT NULL,
    mtime           TEXT NOT NULL,          -- ISO 8601 file modification time (last-resort date)
    title           TEXT,
    owner           TEXT NOT NULL DEFAULT 'unassigned',
    owner_source    TEXT NOT NULL DEFAULT 'default',  -- front_matter | config | default
    doc_date        TEXT,                   -- ISO date: the most specific metadata date
    doc_date_source TEXT,                   -- e.g. 'front_matter:updated', 'pdf:info:ModDate', 'file:mtime'
    expires         TEXT,                   -- ISO date from metadata (front matter, schema.org, OG)
    meta_dates      TEXT NOT NULL DEFAULT '[]',  -- JSON list of every MetaDate found
    tags            TEXT NOT NULL DEFAULT '[]',
    status          TEXT NOT NULL DEFAULT 'active',  -- active | removed | failed
    first_seen      TEXT NOT NULL,
    last_seen       TEXT NOT NULL,
    ingested_at     TEXT NOT NULL
);
INSERT INTO "documents" VALUES(1,'billing/landlord-accounts.html','/tmp/f1/kb','html','792a055bd8a7d699874154697cff5f4b7bf7303d4651a8f59731ff3589ed2dff',2280,'2026-12-03T14:38:06+00:00','Accounts for Landlords and Property Managers | Fernhollow Water Cooperative','Billing','config','2025-07-10','og:article:modified_time',NULL,'[{"value": "2025-07-10", "kind": "modified", "source": "og:article:modified_time"}, {"value": "2025-07-10", "kind": "published", "source": "og:article:published_time"}]','[]','removed','2026-12-03T14:38:08Z','2026-12-03T14:38:08Z','2026-12-03T14:38:13Z');
INSERT INTO "documents" VALUES(2,'billing/rates-2025-26.md','/tmp/f1/kb','markdown','c1b4ae940e9c04921a310f10b399e5aa2ef9c945a9211d3d95dd86cacbb4c465',1320,'2026-12-03T14:37:04+00:00','Residential Water Rates 2025–26','Billing','front_matter','2025-06-18','front_matter:updated',NULL,'[{"value": "2025-06-18", "kind": "modified", "source": "front_matter:updated"}]','["rates", "billing", "residential"]','active','2026-12-03T14:38:08Z','2026-12-03T14:38:13Z','2026-12-03T14:38:08Z');
INSERT INTO "documents" VALUES(3,'billing/rates-2026-27.md','/tmp/f1/kb','markdown','a40e5da9c7e3df6a4150a5a8506c0ac46d521c7cfa5566cb358aa95bc93efbb7',1529,'2026-12-03T14:37:04+00:00','Residential Water Rates 2026–27','Billing','front_matter','2026-06-20','front_matter:updated',NULL,'[{"value": "2026-06-20", "kind": "modified", "source": "front_matter:updated"}]','["rates", "billing", "residential"]','active','2026-12-03T14:38:08Z','2026-12-03T14:38:13Z','2026-12-03T14:38:08Z');
INSERT INTO "documents" VALUES(4,'billing/payment-arrangements.md','/tmp/f1/kb','markdown','2b45e6bc730150b8e4dcaf97b4fdac523cb7e15b1f58cd5e8fdd892345e9f763',1019,'2026-12-03T14:37:04+00:00','Payment Plans for Past-Due Balances','Billing','front_matter','2026-05-19','front_matter:updated',NULL,'[{"value": "2026-05-19", "kind": "modified", "source": "front_matter:updated"}]','["billing", "payment plan"]','active','2026-12-03T14:38:08Z','2026-12-03T14:38:13Z','2026-12-03T14:38:08Z');
INSERT INTO "documents" VALUES(5,'billing/rates-service-fees.md','/tmp/f1/kb','markdown','7da759a9949f2519b7611bf80374456edd66d48abb53995643a489d30574fc34',1244,'2026-12-03T14:37:22+00:00','Service Fees and Reconnection Charges','Billing','front_matter','2026-02-20','front_matter:updated',NULL,'[{"value": "2026-02-20", "kind": "modified", "source": "front_matter:updated"}]','["rates", "fees"]','active','2026-12-03T14:38:08Z','2026-12-03T14:38:13Z','2026-12-03T14:38:08Z');
INSERT INTO "documents" VALUES(6,'billing/payment-options.html','/tmp/f1/kb','html','a90b9810af4e6fa5a4e39e76c626dc15921a8328b1674cadd9dee55b5156eed3',2682,'2026-12-03T14:38:12+00:00','Ways to Pay Your Bill | Fernhollow Water Cooperative','Billing','config','2026-09-08','jsonld:dateModified',NULL,'[{"value": "2026-09-08", "kind": "modified", "source": "jsonld:dateModified"}, {"value": "2024-03-01", "kind": "published", "source": "jsonld:datePublished"}]','[]','active','2026-12-03T14:38:13Z','2026-12-03T14:38:13Z','2026-12-03T14:38:13Z');
CREATE TABLE ingest_errors (
    path        TEXT PRIMARY KEY,
    source_root TEXT NOT NULL,
    kind        TEXT NOT NULL,              -- e.g. encrypted, needs_ocr, too_large, unreadable, parse
    error       TEXT NOT NULL,
    recorded_at TEXT NOT NULL
);
CREATE TABLE meta (
    key   TEXT PRIMARY KEY,
    value TEXT NOT NULL
);
INSERT INTO "meta" VALUES('schema_version','3');
INSERT INTO "meta" VALUES('tokenizer','tok2:english:english:9148be5e0194');
INSERT INTO "meta" VALUES('ingest:failed','{}');
INSERT INTO "meta" VALUES('ingest:parser','3f97a61cbea6ce8a');
INSERT INTO "meta" VALUES('ingest:last','2026-12-03T14:38:13Z');
CREATE TABLE passages (
    id           INTEGER PRIMARY KEY,
    document_id  INTEGER NOT NULL REFERENCES documents(id) ON DELETE CASCADE,
    ordinal      INTEGER NOT NULL,
    text         TEXT NOT NULL,
    heading_path TEXT NOT NULL DEFAULT '[]',  -- JSON list, e.g. ["Billing", "Late fees"]
    page         INTEGER,
    char_start   INTEGER NOT NULL,
    char_end     INTEGER NOT NULL,
    token_ids    BLOB NOT NULL,
    token_count  INTEGER NOT NULL,
    UNIQUE (document_id, ordinal)
);
INSERT INTO "passages" VALUES(3,2,0,'Residential Water Rates 2025–26

These rates are effective July 1, 2025, as approved by the Fernhollow Water Cooperative board of
directors for single-family and duplex residential accounts.

Monthly base charge

Each residential account pays a monthly base charge based on the size of its water meter. The base
charge pays for meter reading, billing and maintenance of the distribution pipes. With the usual
5/8-inch residential meter the monthly base charge is $19.85.

| Meter size | Monthly base charge |
|---|---|
| 5/8-inch residential meter | $19.85 |
| 3/4-inch residential meter | $25.20 |
| 1-inch residential meter | $35.90 |','["Residential Water Rates 2025–26"]',NULL,0,636,X'6300000039000000610000004D0000004F00000061000000590000005D0000004D000000530000005B00000039000000550000005400000056000000640000005A0000005800000063000000010000005F000000060000000A000000100000006300000001000000270000005F000000060000000A0000000600000065000000390000001A000000060000000A000000270000001A00000062000000080000005E0000005700000060000000660000005C000000630000001A0000005F000000060000000A0000004B000000510000001A000000650000005F000000060000000A0000005C000000630000001A0000004B000000510000005C000000630000001A0000004E0000004C0000005C000000630000001A0000005000000052000000',72);
INSERT INTO "passages" VALUES(4,2,1,'Usage charge per 1,000 gallons

The usage charge is billed for each 1,000 gallons recorded by your meter, in three tiers:

- Tier 1, the first 4,000 gallons: $3.90 per 1,000 gallons
- Tier 2, 4,001 to 12,000 gallons: $5.45 per 1,000 gallons
- Tier 3, above 12,000 gallons: $7.40 per 1,000 gallons

How the tiers work

Only the gallons inside each tier are charged at that tier''s price. A household that uses 6,000
gallons in one billing period pays the Tier 1 price for the first 4,000 gallons and the Tier 2 price for the
remaining 2,000 gallons.','["Residential Water Rates 2025–26"]',NULL,638,1185,X'350000000A00000071000000670000006E000000350000000A0000000800000010000000670000006E000000740000001A0000007600000077000000770000006D000000670000006E0000005200000071000000670000006E000000770000006800000069000000670000006E0000006B00000071000000670000006E000000770000006C00000069000000670000006E0000006A00000071000000670000006E0000007700000079000000220000006E0000007000000010000000770000000A00000077000000730000006F00000078000000670000006E0000002100000008000000720000002700000077000000730000006D000000670000006E000000770000007300000075000000670000006E000000',69);
INSERT INTO "passages" VALUES(5,3,0,'Residential Water Rates 2026–27

These rates are effective July 1, 2026, as approved by the Fernhollow Water Cooperative board of
directors. They apply to every single-family and duplex residential account inside the service area.

Monthly base charge

Every residential account pays a monthly base charge that depends on the size of the water meter.
The base charge covers meter reading, billing and the upkeep of the pipes that bring water to your
street, whether or not you use any water that month.

| Meter size | Monthly base charge |
|---|---|
| 5/8-inch residential meter | $21.40 |
| 3/4-inch residential meter | $27.10 |
| 1-inch residential meter | $38.60 |

Most homes have a 5/8-inch meter, so for most homes the monthly base charge is $21.40. The meter size is printed on your bill next to your meter number.','["Residential Water Rates 2026–27"]',NULL,0,822,X'6300000039000000610000007B0000007D00000061000000590000005D0000007B000000530000005B000000390000005500000054000000560000008000000085000000640000005A000000580000006300000001000000700000002B000000810000005F000000060000000A000000850000006300000001000000270000005F000000060000000A0000008400000065000000390000001A000000060000000A000000830000001A00000062000000080000008B0000006000000082000000390000008A0000008C0000007800000003000000390000005F0000001A000000650000005F000000060000000A0000005C000000630000001A0000007C0000006A0000005C000000630000001A0000007D0000007A0000005C000000630000001A0000007E0000007F00000087000000860000005C0000001A00000087000000860000005F000000060000000A0000007C0000006A0000001A000000650000008900000008000000470000001A00000088000000',93);
INSERT INTO "passages" VALUES(6,3,1,'Usage charge per 1,000 gallons

On top of the base charge you pay a usage charge for each 1,000 gallons of water that passes through
your meter. The price per 1,000 gallons rises in tiers, so that essential indoor use stays affordable:

- Tier 1, the first 4,000 gallons: $4.15 per 1,000 gallons
- Tier 2, 4,001 to 12,000 gallons: $5.80 per 1,000 gallons
- Tier 3, above 12,000 gallons: $7.95 per 1,000 gallons

Questions about your rates

Billing can explain how your charges were calculated. Call Customer Care at 555-0100 or write to
billing@fernhollow-water.example.','["Residential Water Rates 2026–27"]',NULL,824,1394,X'350000000A00000071000000670000006E0000009E000000060000000A00000027000000350000000A00000010000000670000006E0000003900000026000000320000001A0000007300000071000000670000006E0000009D00000077000000980000009B000000780000002E00000093000000770000006D000000670000006E0000008E00000071000000670000006E000000770000006800000069000000670000006E0000009000000071000000670000006E000000770000006C00000069000000670000006E0000009100000071000000670000006E0000009C0000009200000061000000080000009A0000000A000000940000009500000097000000960000008F0000008D0000009F000000080000005B0000003900000099000000',72);
INSERT INTO "passages" VALUES(7,4,0,'Payment Plans for Past-Due Balances

If you have fallen behind, a payment plan spreads a past-due balance over several months so you can
catch up without losing service.

How to set up a payment plan

Call Customer Care at 555-0100 or visit the Customer Service Office. We will agree a plan of up to
twelve monthly installments. Each installment is added to your regular monthly bill. You do not need
to pay anything up front to set up a plan.

Keeping to the plan

As long as each bill, including the installment, is paid by its due date, no late fees are charged
and no collection action is taken. If you miss an installment, call us before the next due date and
we will try to adjust the plan once.','["Payment Plans for Past-Due Balances"]',NULL,0,701,X'BA000000BB000000B9000000AA0000003D000000AB000000A6000000BA000000BB000000BF000000B9000000AA0000003D000000B7000000BE0000005F000000A7000000C30000004A000000B20000002B000000BD000000C3000000BA000000BB0000009500000097000000960000008F0000008D000000C4000000970000002B000000B5000000A3000000BB000000C3000000C20000005F000000AF00000010000000AF000000A1000000BC0000005F00000008000000B400000027000000A4000000C3000000AD000000BD000000C3000000BB00000013000000BB000000B10000001000000008000000AE000000AF000000B8000000AA000000A9000000B0000000AC0000000A000000A8000000A0000000C0000000B3000000AF0000009500000034000000A500000047000000AA000000A9000000C1000000A2000000BB000000B6000000',82);
INSERT INTO "passages" VALUES(8,4,1,'If you need more help

Households with a low income may also qualify for the Helping Hands program, which lowers the monthly
bill itself. A payment plan and Helping Hands can be combined.','["Payment Plans for Past-Due Balances", "If you need more help"]',NULL,703,890,X'B4000000CD000000C80000006F000000CB000000C900000019000000C5000000CF000000C8000000C7000000CE000000CC0000005F00000008000000CA000000BA000000BB000000C8000000C7000000C6000000',21);
INSERT INTO "passages" VALUES(9,5,0,'Service Fees and Reconnection Charges

This fee schedule is effective March 1, 2026. These one-time charges are added to the next bill of
the account that requested or caused the work.

Reconnection fee after a shutoff

When service has been shut off for non-payment, the account must be brought current or placed on a
payment arrangement before we restore water. The reconnection fee is $45.00 during business hours and
$120.00 for a same-day reconnection after 4:30 p.m. or on weekends. Reconnection normally happens within
one business day of payment.

Other service fees

- Returned payment fee (bounced check or declined bank draft): $25.00
- Meter test: if you think your meter is wrong, a meter test costs $60.00, refunded if the meter is
  found to over-register
- Copies of account records older than two years: $30.00 per request
- Tampering with a locked meter: $250.00 plus the cost of repairs','["Service Fees and Reconnection Charges"]',NULL,0,905,X'2B000000AC000000EB0000000A000000AC000000F300000059000000E40000007B00000021000000330000000A000000A1000000470000000800000001000000EF000000DA00000079000000EB000000AC000000D4000000F40000002B000000D60000002D00000020000000E5000000BA000000010000001C000000D8000000DC000000E9000000BA00000004000000A5000000F000000039000000EB000000AC0000006B000000D00000000F000000D9000000E2000000D1000000D0000000F2000000DD000000EB000000D4000000D3000000FA000000EB000000E6000000E1000000FB00000021000000D9000000DD000000BA000000E80000002B000000AC000000F1000000BA000000AC000000D7000000DB000000DE000000D5000000DF0000004E000000D00000001A000000F6000000F80000001A000000FC0000001A000000F60000000E0000007F000000D0000000EC0000001A000000E0000000B7000000ED000000410000000100000074000000E7000000F7000000F9000000FD000000D3000000D000000071000000EF000000F5000000E30000001A000000D2000000D0000000EA0000000E000000EE000000',109);
INSERT INTO "passages" VALUES(10,5,1,'Where the money goes

Fees recover the cost of the truck roll, the technician''s time and the paperwork, so that these
costs are paid by the customers who cause them rather than by all members through the base charge.','["Service Fees and Reconnection Charges", "Where the money goes"]',NULL,907,1123,X'01010000FF000000AC000000040100000E00000007010000050100000601000033000000020100000E000000B800000097000000DA00000003010000F7000000FE0000000001000032000000060000000A000000',21);
INSERT INTO "passages" VALUES(11,6,0,'Ways to Pay Your Bill

You can pay your water bill in several ways. Whichever you choose, have your account number ready; it is printed at the top of every bill.

Pay online

Use the member portal to pay with a debit card, credit card or a one-time bank transfer. Online payments are free and post to your account the same business day.

Pay by phone

Call the automated pay-by-phone line at 555-0142, available 24 hours a day, and follow the prompts to pay your bill by card or bank account. To pay by phone with help from a person, call Customer Care at 555-0100 during office hours. There is no fee for phone payments.','["Ways to Pay Your Bill"]',NULL,0,621,X'190100002700000008000000270000003900000008000000BE000000190100001A0100000B000000010000008800000017010000890000009E00000085000000080000002700000011010000780000000001000014010000270000000E0100000C0100000D0100000C0100002100000033000000D50000001801000011010000BA0000000F0100001501000001000000F2000000D9000000DD0000002700000013010000950000000A0100002700000013010000100100008F000000080100000B01000009010000E2000000DD000000440000001601000027000000080000000C010000D5000000010000002700000013010000C8000000120100009500000097000000960000008F0000008D0000000F000000B5000000E2000000AC00000013010000BA000000',74);
INSERT INTO "passages" VALUES(12,6,1,'Pay by mail

Send a check or money order payable to Fernhollow Water Cooperative, with the payment stub from your bill, to PO Box 2210, Fernhollow. Allow five to seven days for mailed payments to arrive.

Pay in person

Pay in person with cash, check or card at the Customer Service Office, 410 Millrace Road, Fernhollow, Monday to Friday, 8 a.m. to 5 p.m. A drop box beside the front door takes checks at any hour. You can also pay cash at any Northgate Market customer service desk; bring your bill so the cashier can scan the barcode.','["Ways to Pay Your Bill"]',NULL,623,1160,X'270000001600000048000000DB000000010100002D0100002E0100005B0000003900000055000000BA00000033010000080000002F010000210100001B0100005B0000001D0100002701000032010000DD00000016000000BA0000001E0100002700000012010000270000001201000022010000DB0000000C010000970000002B000000B50000001C0100002A010000300100005B0000002B01000028010000260100002101000020010000AD0000002501000034010000DB00000003000000E2000000C50000002700000022010000030000002C01000029010000970000002B00000024010000820000000800000023010000310100001F010000',63);
CREATE TABLE questions (
    set_name     TEXT NOT NULL,             -- the question file's name
    position     INTEGER NOT NULL,
    qid          TEXT NOT NULL,
    question     TEXT NOT NULL,
    owner        TEXT,
    topic        TEXT,
    weight       REAL NOT NULL DEFAULT 1.0,
    horizon_days INTEGER,
    PRIMARY KEY (set_name, position)
);
INSERT INTO "questions" VALUES('questions.csv',0,'q01','How much is the monthly base charge for a 5/8-inch residential meter?','Billing','rates',96.0,NULL);
INSERT INTO "questions" VALUES('questions.csv',1,'q02','What is the usage charge per 1,000 gallons?','Billing','rates',74.0,NULL);
INSERT INTO "questions" VALUES('questions.csv',2,'q03','How can I pay my water bill by phone?','Billing','payments',88.0,NULL);
INSERT INTO "questions" VALUES('questions.csv',3,'q04','Where can I pay my bill in person with cash?','Billing','payments',41.0,NULL);
INSERT INTO "questions" VALUES('questions.csv',4,'q14','As a landlord, can I keep the water account in my name between tenants?','Billing','landlord',18.0,NULL);
INSERT INTO "questions" VALUES('questions.csv',5,'q15','Do landlords receive a notice when a tenant closes their account?','Billing','landlord',9.0,NULL);
INSERT INTO "questions" VALUES('questions.csv',6,'q33','What is the reconnection fee after my water is shut off for non-payment?','Billing','fees',26.0,NULL);
INSERT INTO "questions" VALUES('questions.csv',7,'q34','How much does a meter test cost if I think my meter is wrong?','Billing','fees',7.0,NULL);
CREATE TABLE redaction_counts (
    set_name TEXT NOT NULL,
    kind     TEXT NOT NULL,
    count    INTEGER NOT NULL,
    PRIMARY KEY (set_name, kind)
);
CREATE TABLE results (
    run_id   INTEGER NOT NULL REFERENCES runs(id) ON DELETE CASCADE,
    position INTEGER NOT NULL,
    qid      TEXT NOT NULL,
    verdict  TEXT NOT NULL,
    weight   REAL NOT NULL,
    result   TEXT NOT NULL,
    PRIMARY KEY (run_id, position)
);
INSERT INTO "results" VALUES(1,0,'q01','covered',96.0,'{"action":null,"evidence":[{"answer_type":"amount","answer_type_found":true,"as_of":"2025-07-01","as_of_source":"statement","document":"billing/rates-2025-26.md","expires":null,"fresh":false,"owner":"Billing","page":null,"passage":3,"rank":1,"reasons":["too_old"],"score":9.4243,"section":"Residential Water Rates 2025–26","signals":{"bm25":0.5778,"coverage":0.7195,"phrase":0.7567,"window":0.7195},"statements":[{"end":"2026-06-30","expression":"2025–26","granularity":"year","role":"period","start":"2025-07-01","text":"Residential Water Rates 2025–26"},{"end":"2025-07-01","expression":"July 1, 2025","granularity":"day","role":"effective","start":"2025-07-01","text":"These rates are effective July 1, 2025, as approved by the Fernhollow Water Cooperative board of directors for single-family and duplex residential accounts."}],"support":0.684448,"supporting":true,"terms":{"base":1.2595,"charg":0.4527,"inch":2.4767,"meter":0.9803,"month":1.4941,"residenti":2.7609},"text":"Residential Water Rates 2025–26\n\nThese rates are effective July 1, 2025, as approved by the Fernhollow Water Cooperative board of\ndirectors for single-family and duplex residential accounts.\n\nMonthly base charge\n\nEach residential account pays a monthly base charge based on the size of its water meter. The base\ncharge pays for meter reading, billing and maintenance of the distribution pipes. With the usual\n5/8-inch residential meter the monthly base charge is $19.85.\n\n| Meter size | Monthly base charge |\n|---|---|\n| 5/8-inch residential meter | $19.85 |\n| 3/4-inch residential meter | $25.20 |\n| 1-inch residential meter | $35.90 |"},{"answer_type":"amount","answer_type_found":true,"as_of":"2026-06-01","as_of_source":"metadata","document":"billing/rates-2026-27.md","expires":null,"fresh":true,"owner":"Billing","page":null,"passage":5,"rank":2,"reasons":[],"score":9.031,"section":"Residential Water Rates 2026–27","signals":{"bm25":0.5537,"coverage":0.7195,"phrase":0.7567,"window":0.7195},"statements":[{"end":"2027-06-30","expression":"2026–27","granularity":"year","role":"period","start":"2026-07-01","text":"Residential Water Rates 2026–27"},{"end":"2026-07-01","expression":"July 1, 2026","granularity":"day","role":"effective","start":"2026-07-01","text":"These rates are effective July 1, 2026, as approved by the Fernhollow Water Cooperative board of directors."}],"support":0.677213,"supporting":true,"terms":{"base":1.1649,"charg":0.4333,"inch":2.3511,"meter":0.9878,"month":1.5021,"residenti":2.5919},"text":"Residential Water Rates 2026–27\n\nThese rates are effective July 1, 2026, as approved by the Fernhollow Water Cooperative board of\ndirectors. They apply to every single-family and duplex residential account inside the service area.\n\nMonthly base charge\n\nEvery residential account pays a monthly base charge that depends on the size of the water meter.\nThe base charge covers meter reading, billing and the upkeep of the pipes that bring water to your\nstreet, whether or not you use any water that month.\n\n| Meter size | Monthly base charge |\n|---|---|\n| 5/8-inch residential meter | $21.40 |\n| 3/4-inch residential meter | $27.10 |\n| 1-inch residential meter | $38.60 |\n\nMost homes have a 5/8-inch meter, so for most homes the monthly base charge is $21.40. The meter size is printed on your bill next to your meter number."},{"answer_type":"amount","answer_type_found":true,"as_of":"2026-06-01","as_of_source":"metadata","document":"billing/rates-2026-27.md","expires":null,"fresh":true,"owner":"Billing","page":null,"passage":6,"rank":3,"reasons":[],"score":1.6156,"section":"Residential Water Rates 2026–27","signals":{"bm25":0.0991,"coverage":0.1992,"phrase":0.0778,"window":0.1992},"statements":[],"support":0.1449,"supporting":false,"terms":{"base":0.6735,"charg":0.431,"meter":0.5112},"text":"Usage charge per 1,000 gallons\n\nOn top of the base charge you pay a usage charge for each 1,000 gallons of water that passes through\nyour meter. The price per 1,000 gallons rises in tiers, so that essential indoor use stays affordable:\n\n- Tier 1, the first 4,000 gallons: $4.15 per 1,000 gallons\n- Tier 2, 4,001 to 12,000 gallons: $5.80 per 1,000 gallons\n- Tier 3, above 12,000 gallons: $7.95 per 1,000 gallons\n\nQuestions about your rates\n\nBilling can explain how your charges were calculated. Call Customer Care at 555-0100 or write to\nbilling@fernhollow-water.example."}],"flags":["stale_competitor"],"horizon_days":365,"id":"q01","missing_terms":["much"],"owner":"Billing","question":"How much is the monthly base charge for a 5/8-inch residential meter?","reasons":[],"support":0.6772,"terms":["much","month","base","charg","inch","residenti","meter"],"topic":"rates","verdict":"covered","weight":96.0}');
INSERT INTO "results" VALUES(1,1,'q02','covered',74.0,'{"action":null,"evidence":[{"answer_type":null,"answer_type_found":true,"as_of":"2025-06-18","as_of_source":"metadata","document":"billing/rates-2025-26.md","expires":null,"fresh":false,"owner":"Billing","page":null,"passage":4,"rank":1,"reasons":["too_old"],"score":9.7855,"section":"Residential Water Rates 2025–26","signals":{"bm25":0.8071,"coverage":1.0,"phrase":1.0,"window":1.0},"statements":[],"support":0.942119,"supporting":true,"terms":{"000":2.9331,"charg":0.4028,"gallon":2.9578,"per":1.929,"usag":1.5628},"text":"Usage charge per 1,000 gallons\n\nThe usage charge is billed for each 1,000 gallons recorded by your meter, in three tiers:\n\n- Tier 1, the first 4,000 gallons: $3.90 per 1,000 gallons\n- Tier 2, 4,001 to 12,000 gallons: $5.45 per 1,000 gallons\n- Tier 3, above 12,000 gallons: $7.40 per 1,000 gallons\n\nHow the tiers work\n\nOnly the gallons inside each tier are charged at that tier''s price. A household that uses 6,000\ngallons in one billing period pays the Tier 1 price for the first 4,000 gallons and the Tier 2 price for the\nremaining 2,000 gallons."},{"answer_type":null,"answer_type_found":true,"as_of":"2026-06-01","as_of_source":"metadata","document":"billing/rates-2026-27.md","expires":null,"fresh":true,"owner":"Billing","page":null,"passage":6,"rank":2,"reasons":[],"score":9.7015,"section":"Residential Water Rates 2026–27","signals":{"bm25":0.8001,"coverage":1.0,"phrase":1.0,"window":1.0},"statements":[],"support":0.940039,"supporting":true,"terms":{"000":2.858,"charg":0.431,"gallon":2.858,"per":2.0108,"usag":1.5435},"text":"Usage charge per 1,000 gallons\n\nOn top of the base charge you pay a usage charge for each 1,000 gallons of water that passes through\nyour meter. The price per 1,000 gallons rises in tiers, so that essential indoor use stays affordable:\n\n- Tier 1, the first 4,000 gallons: $4.15 per 1,000 gallons\n- Tier 2, 4,001 to 12,000 gallons: $5.80 per 1,000 gallons\n- Tier 3, above 12,000 gallons: $7.95 per 1,000 gallons\n\nQuestions about your rates\n\nBilling can explain how your charges were calculated. Call Customer Care at 555-0100 or write to\nbilling@fernhollow-water.example."},{"answer_type":null,"answer_type_found":true,"as_of":"2025-07-10","as_of_source":"metadata","document":"billing/landlord-accounts.html","expires":null,"fresh":true,"owner":"Billing","page":null,"passage":1,"rank":3,"reasons":[],"score":1.232,"section":"Accounts for Landlords and Property Managers","signals":{"bm25":0.1016,"coverage":0.2546,"phrase":0.0,"window":0.2546},"statements":[],"support":0.157762,"supporting":false,"terms":{"charg":0.2264,"usag":1.0056},"text":"Accounts for Landlords and Property Managers\n\nOwners of rental property can choose who receives the water bill, and can make sure the water stays on between tenants.\n\nWhose name is on the account\n\nA tenant may open the account in their own name, or the landlord may keep the account in the owner''s name and pass the cost on through the lease. For buildings with one shared meter, the account must stay in the owner''s name. Tell us which arrangement you want on the landlord enrollment form.\n\nLandlord continuity of service\n\nWith a continuity agreement, the account moves to the landlord''s name automatically when a tenant closes an account, so the water is never shut off at a vacant rental. The landlord receives a notice by mail or e-mail each time a tenant closes an account, and the landlord pays only the base charge and any usage during the vacancy."}],"flags":["stale_competitor"],"horizon_days":365,"id":"q02","missing_terms":[],"owner":"Billing","question":"What is the usage charge per 1,000 gallons?","reasons":[],"support":0.94,"terms":["usag","charg","per","000","gallon"],"topic":"rates","verdict":"covered","weight":74.0}');
INSERT INTO "results" VALUES(1,2,'q03','gap',88.0,'{"action":"write","evidence":[{"answer_type":null,"answer_type_found":true,"as_of":"2025-07-01","as_of_source":"statement","document":"billing/rates-2025-26.md","expires":null,"fresh":false,"owner":"Billing","page":null,"passage":3,"rank":1,"reasons":["too_old"],"score":1.9244,"section":"Residential Water Rates 2025–26","signals":{"bm25":0.2539,"coverage":0.3964,"phrase":0.0,"window":0.3539},"statements":[{"end":"2026-06-30","expression":"2025–26","granularity":"year","role":"period","start":"2025-07-01","text":"Residential Water Rates 2025–26"},{"end":"2025-07-01","expression":"July 1, 2025","granularity":"day","role":"effective","start":"2025-07-01","text":"These rates are effective July 1, 2025, as approved by the Fernhollow Water Cooperative board of directors for single-family and duplex residential accounts."}],"support":0.265876,"supporting":false,"terms":{"bill":0.1424,"pay":0.7091,"water":1.0728},"text":"Residential Water Rates 2025–26\n\nThese rates are effective July 1, 2025, as approved by the Fernhollow Water Cooperative board of\ndirectors for single-family and duplex residential accounts.\n\nMonthly base charge\n\nEach residential account pays a monthly base charge based on the size of its water meter. The base\ncharge pays for meter reading, billing and maintenance of the distribution pipes. With the usual\n5/8-inch residential meter the monthly base charge is $19.85.\n\n| Meter size | Monthly base charge |\n|---|---|\n| 5/8-inch residential meter | $19.85 |\n| 3/4-inch residential meter | $25.20 |\n| 1-inch residential meter | $35.90 |"},{"answer_type":null,"answer_type_found":true,"as_of":"2026-06-01","as_of_source":"metadata","document":"billing/rates-2026-27.md","expires":null,"fresh":true,"owner":"Billing","page":null,"passage":5,"rank":2,"reasons":[],"score":1.8015,"section":"Residential Water Rates 2026–27","signals":{"bm25":0.2377,"coverage":0.3964,"phrase":0.0,"window":0.3964},"statements":[{"end":"2027-06-30","expression":"2026–27","granularity":"year","role":"period","start":"2026-07-01","text":"Residential Water Rates 2026–27"},{"end":"2026-07-01","expression":"July 1, 2026","granularity":"day","role":"effective","start":"2026-07-01","text":"These rates are effective July 1, 2026, as approved by the Fernhollow Water Cooperative board of directors."}],"support":0.269521,"supporting":false,"terms":{"bill":0.1819,"pay":0.4547,"water":1.1649},"text":"Residential Water Rates 2026–27\n\nThese rates are effective July 1, 2026, as approved by the Fernhollow Water Cooperative board of\ndirectors. They apply to every single-family and duplex residential account inside the service area.\n\nMonthly base charge\n\nEvery residential account pays a monthly base charge that depends on the size of the water meter.\nThe base charge covers meter reading, billing and the upkeep of the pipes that bring water to your\nstreet, whether or not you use any water that month.\n\n| Meter size | Monthly base charge |\n|---|---|\n| 5/8-inch residential meter | $21.40 |\n| 3/4-inch residential meter | $27.10 |\n| 1-inch residential meter | $38.60 |\n\nMost homes have a 5/8-inch meter, so for most homes the monthly base charge is $21.40. The meter size is printed on your bill next to your meter number."},{"answer_type":null,"answer_type_found":true,"as_of":"2026-06-01","as_of_source":"metadata","document":"billing/rates-2026-27.md","expires":null,"fresh":true,"owner":"Billing","page":null,"passage":6,"rank":3,"reasons":[],"score":1.6431,"section":"Residential Water Rates 2026–27","signals":{"bm25":0.2168,"coverage":0.3964,"phrase":0.0,"window":0.3539},"statements":[],"support":0.254741,"supporting":false,"terms":{"bill":0.1976,"pay":0.5112,"water":0.9343},"text":"Usage charge per 1,000 gallons\n\nOn top of the base charge you pay a usage charge for each 1,000 gallons of water that passes through\nyour meter. The price per 1,000 gallons rises in tiers, so that essential indoor use stays affordable:\n\n- Tier 1, the first 4,000 gallons: $4.15 per 1,000 gallons\n- Tier 2, 4,001 to 12,000 gallons: $5.80 per 1,000 gallons\n- Tier 3, above 12,000 gallons: $7.95 per 1,000 gallons\n\nQuestions about your rates\n\nBilling can explain how your charges were calculated. Call Customer Care at 555-0100 or write to\nbilling@fernhollow-water.example."}],"flags":[],"horizon_days":365,"id":"q03","missing_terms":["phone"],"owner":"Billing","question":"How can I pay my water bill by phone?","reasons":[],"support":0.2695,"terms":["pay","water","bill","phone"],"topic":"payments","verdict":"gap","weight":88.0}');
INSERT INTO "results" VALUES(1,3,'q04','gap',41.0,'{"action":"write","evidence":[{"answer_type":"place","answer_type_found":false,"as_of":"2025-07-01","as_of_source":"statement","document":"billing/rates-2025-26.md","expires":null,"fresh":false,"owner":"Billing","page":null,"passage":3,"rank":1,"reasons":["too_old"],"score":0.8516,"section":"Residential Water Rates 2025–26","signals":{"bm25":0.0801,"coverage":0.1392,"phrase":0.0,"window":0.1392},"statements":[{"end":"2026-06-30","expression":"2025–26","granularity":"year","role":"period","start":"2025-07-01","text":"Residential Water Rates 2025–26"},{"end":"2025-07-01","expression":"July 1, 2025","granularity":"day","role":"effective","start":"2025-07-01","text":"These rates are effective July 1, 2025, as approved by the Fernhollow Water Cooperative board of directors for single-family and duplex residential accounts."}],"support":0.084284,"supporting":false,"terms":{"bill":0.1424,"pay":0.7091},"text":"Residential Water Rates 2025–26\n\nThese rates are effective July 1, 2025, as approved by the Fernhollow Water Cooperative board of\ndirectors for single-family and duplex residential accounts.\n\nMonthly base charge\n\nEach residential account pays a monthly base charge based on the size of its water meter. The base\ncharge pays for meter reading, billing and maintenance of the distribution pipes. With the usual\n5/8-inch residential meter the monthly base charge is $19.85.\n\n| Meter size | Monthly base charge |\n|---|---|\n| 5/8-inch residential meter | $19.85 |\n| 3/4-inch residential meter | $25.20 |\n| 1-inch residential meter | $35.90 |"},{"answer_type":"place","answer_type_found":true,"as_of":"2025-06-18","as_of_source":"metadata","document":"billing/rates-2025-26.md","expires":null,"fresh":false,"owner":"Billing","page":null,"passage":4,"rank":2,"reasons":["too_old"],"score":0.7205,"section":"Residential Water Rates 2025–26","signals":{"bm25":0.0678,"coverage":0.1392,"phrase":0.0,"window":0.1392},"statements":[],"support":0.089948,"supporting":false,"terms":{"bill":0.2001,"pay":0.5204},"text":"Usage charge per 1,000 gallons\n\nThe usage charge is billed for each 1,000 gallons recorded by your meter, in three tiers:\n\n- Tier 1, the first 4,000 gallons: $3.90 per 1,000 gallons\n- Tier 2, 4,001 to 12,000 gallons: $5.45 per 1,000 gallons\n- Tier 3, above 12,000 gallons: $7.40 per 1,000 gallons\n\nHow the tiers work\n\nOnly the gallons inside each tier are charged at that tier''s price. A household that uses 6,000\ngallons in one billing period pays the Tier 1 price for the first 4,000 gallons and the Tier 2 price for the\nremaining 2,000 gallons."},{"answer_type":"place","answer_type_found":false,"as_of":"2026-06-01","as_of_source":"metadata","document":"billing/rates-2026-27.md","expires":null,"fresh":true,"owner":"Billing","page":null,"passage":6,"rank":3,"reasons":[],"score":0.7088,"section":"Residential Water Rates 2026–27","signals":{"bm25":0.0667,"coverage":0.1392,"phrase":0.0,"window":0.1089},"statements":[],"support":0.075195,"supporting":false,"terms":{"bill":0.1976,"pay":0.5112},"text":"Usage charge per 1,000 gallons\n\nOn top of the base charge you pay a usage charge for each 1,000 gallons of water that passes through\nyour meter. The price per 1,000 gallons rises in tiers, so that essential indoor use stays affordable:\n\n- Tier 1, the first 4,000 gallons: $4.15 per 1,000 gallons\n- Tier 2, 4,001 to 12,000 gallons: $5.80 per 1,000 gallons\n- Tier 3, above 12,000 gallons: $7.95 per 1,000 gallons\n\nQuestions about your rates\n\nBilling can explain how your charges were calculated. Call Customer Care at 555-0100 or write to\nbilling@fernhollow-water.example."}],"flags":[],"horizon_days":365,"id":"q04","missing_terms":["person","cash"],"owner":"Billing","question":"Where can I pay my bill in person with cash?","reasons":[],"support":0.0899,"terms":["pay","bill","person","cash"],"topic":"payments","verdict":"gap","weight":41.0}');
INSERT INTO "results" VALUES(1,4,'q14','covered',18.0,'{"action":null,"evidence":[{"answer_type":null,"answer_type_found":true,"as_of":"2025-07-10","as_of_source":"metadata","document":"billing/landlord-accounts.html","expires":null,"fresh":true,"owner":"Billing","page":null,"passage":1,"rank":1,"reasons":[],"score":12.9056,"section":"Accounts for Landlords and Property Managers","signals":{"bm25":0.6304,"coverage":1.0,"phrase":0.4496,"window":0.7114},"statements":[],"support":0.721327,"supporting":true,"terms":{"account":1.2834,"between":1.7496,"keep":1.301,"landlord":2.6826,"name":2.5053,"tenant":2.3683,"water":1.0154},"text":"Accounts for Landlords and Property Managers\n\nOwners of rental property can choose who receives the water bill, and can make sure the water stays on between tenants.\n\nWhose name is on the account\n\nA tenant may open the account in their own name, or the landlord may keep the account in the owner''s name and pass the cost on through the lease. For buildings with one shared meter, the account must stay in the owner''s name. Tell us which arrangement you want on the landlord enrollment form.\n\nLandlord continuity of service\n\nWith a continuity agreement, the account moves to the landlord''s name automatically when a tenant closes an account, so the water is never shut off at a vacant rental. The landlord receives a notice by mail or e-mail each time a tenant closes an account, and the landlord pays only the base charge and any usage during the vacancy."},{"answer_type":null,"answer_type_found":true,"as_of":"2025-07-10","as_of_source":"metadata","document":"billing/landlord-accounts.html","expires":null,"fresh":true,"owner":"Billing","page":null,"passage":2,"rank":2,"reasons":[],"score":8.029,"section":"Accounts for Landlords and Property Managers","signals":{"bm25":0.3922,"coverage":0.5522,"phrase":0.139,"window":0.3929},"statements":[],"support":0.389697,"supporting":false,"terms":{"account":1.1803,"landlord":1.7376,"name":2.2668,"tenant":2.8443},"text":"Copies of tenant bills\n\nA tenant can authorize us to send duplicate bills to the landlord or property manager. Without that authorization we cannot share a tenant''s account details, because the tenant owns that information.\n\nLiens on unpaid balances\n\nUnpaid balances on owner-name accounts can become a lien on the property. Balances on tenant-name accounts stay with the tenant and follow them to their next address."},{"answer_type":null,"answer_type_found":true,"as_of":"2026-06-01","as_of_source":"metadata","document":"billing/rates-2026-27.md","expires":null,"fresh":true,"owner":"Billing","page":null,"passage":5,"rank":3,"reasons":[],"score":2.0251,"section":"Residential Water Rates 2026–27","signals":{"bm25":0.0989,"coverage":0.149,"phrase":0.0,"window":0.149},"statements":[{"end":"2027-06-30","expression":"2026–27","granularity":"year","role":"period","start":"2026-07-01","text":"Residential Water Rates 2026–27"},{"end":"2026-07-01","expression":"July 1, 2026","granularity":"day","role":"effective","start":"2026-07-01","text":"These rates are effective July 1, 2026, as approved by the Fernhollow Water Cooperative board of directors."}],"support":0.104167,"supporting":false,"terms":{"account":0.8602,"water":1.1649},"text":"Residential Water Rates 2026–27\n\nThese rates are effective July 1, 2026, as approved by the Fernhollow Water Cooperative board of\ndirectors. They apply to every single-family and duplex residential account inside the service area.\n\nMonthly base charge\n\nEvery residential account pays a monthly base charge that depends on the size of the water meter.\nThe base charge covers meter reading, billing and the upkeep of the pipes that bring water to your\nstreet, whether or not you use any water that month.\n\n| Meter size | Monthly base charge |\n|---|---|\n| 5/8-inch residential meter | $21.40 |\n| 3/4-inch residential meter | $27.10 |\n| 1-inch residential meter | $38.60 |\n\nMost homes have a 5/8-inch meter, so for most homes the monthly base charge is $21.40. The meter size is printed on your bill next to your meter number."}],"flags":[],"horizon_days":730,"id":"q14","missing_terms":[],"owner":"Billing","question":"As a landlord, can I keep the water account in my name between tenants?","reasons":[],"support":0.7213,"terms":["landlord","keep","water","account","name","between","tenant"],"topic":"landlord","verdict":"covered","weight":18.0}');
INSERT INTO "results" VALUES(1,5,'q15','covered',9.0,'{"action":null,"evidence":[{"answer_type":null,"answer_type_found":true,"as_of":"2025-07-10","as_of_source":"metadata","document":"billing/landlord-accounts.html","expires":null,"fresh":true,"owner":"Billing","page":null,"passage":1,"rank":1,"reasons":[],"score":13.0858,"section":"Accounts for Landlords and Property Managers","signals":{"bm25":0.6174,"coverage":1.0,"phrase":0.7968,"window":1.0},"statements":[],"support":0.844579,"supporting":true,"terms":{"account":1.2834,"close":2.5009,"landlord":2.6826,"notic":1.7496,"receiv":2.5009,"tenant":2.3683},"text":"Accounts for Landlords and Property Managers\n\nOwners of rental property can choose who receives the water bill, and can make sure the water stays on between tenants.\n\nWhose name is on the account\n\nA tenant may open the account in their own name, or the landlord may keep the account in the owner''s name and pass the cost on through the lease. For buildings with one shared meter, the account must stay in the owner''s name. Tell us which arrangement you want on the landlord enrollment form.\n\nLandlord continuity of service\n\nWith a continuity agreement, the account moves to the landlord''s name automatically when a tenant closes an account, so the water is never shut off at a vacant rental. The landlord receives a notice by mail or e-mail each time a tenant closes an account, and the landlord pays only the base charge and any usage during the vacancy."},{"answer_type":null,"answer_type_found":true,"as_of":"2025-07-10","as_of_source":"metadata","document":"billing/landlord-accounts.html","expires":null,"fresh":true,"owner":"Billing","page":null,"passage":2,"rank":2,"reasons":[],"score":5.7622,"section":"Accounts for Landlords and Property Managers","signals":{"bm25":0.2719,"coverage":0.3795,"phrase":0.0,"window":0.3795},"statements":[],"support":0.271334,"supporting":false,"terms":{"account":1.1803,"landlord":1.7376,"tenant":2.8443},"text":"Copies of tenant bills\n\nA tenant can authorize us to send duplicate bills to the landlord or property manager. Without that authorization we cannot share a tenant''s account details, because the tenant owns that information.\n\nLiens on unpaid balances\n\nUnpaid balances on owner-name accounts can become a lien on the property. Balances on tenant-name accounts stay with the tenant and follow them to their next address."},{"answer_type":null,"answer_type_found":true,"as_of":"2026-03-01","as_of_source":"statement","document":"billing/rates-service-fees.md","expires":null,"fresh":true,"owner":"Billing","page":null,"passage":9,"rank":3,"reasons":[],"score":0.9611,"section":"Service Fees and Reconnection Charges","signals":{"bm25":0.0453,"coverage":0.072,"phrase":0.0,"window":0.072},"statements":[{"end":"2026-03-01","expression":"March 1, 2026","granularity":"day","role":"effective","start":"2026-03-01","text":"This fee schedule is effective March 1, 2026."}],"support":0.04958,"supporting":false,"terms":{"account":0.9611},"text":"Service Fees and Reconnection Charges\n\nThis fee schedule is effective March 1, 2026. These one-time charges are added to the next bill of\nthe account that requested or caused the work.\n\nReconnection fee after a shutoff\n\nWhen service has been shut off for non-payment, the account must be brought current or placed on a\npayment arrangement before we restore water. The reconnection fee is $45.00 during business hours and\n$120.00 for a same-day reconnection after 4:30 p.m. or on weekends. Reconnection normally happens within\none business day of payment.\n\nOther service fees\n\n- Returned payment fee (bounced check or declined bank draft): $25.00\n- Meter test: if you think your meter is wrong, a meter test costs $60.00, refunded if the meter is\n  found to over-register\n- Copies of account records older than two years: $30.00 per request\n- Tampering with a locked meter: $250.00 plus the cost of repairs"}],"flags":[],"horizon_days":730,"id":"q15","missing_terms":[],"owner":"Billing","question":"Do landlords receive a notice when a tenant closes their account?","reasons":[],"support":0.8446,"terms":["landlord","receiv","notic","tenant","close","account"],"topic":"landlord","verdict":"covered","weight":9.0}');
INSERT INTO "results" VALUES(1,6,'q33','covered',26.0,'{"action":null,"evidence":[{"answer_type":null,"answer_type_found":true,"as_of":"2026-03-01","as_of_source":"statement","document":"billing/rates-service-fees.md","expires":null,"fresh":true,"owner":"Billing","page":null,"passage":9,"rank":1,"reasons":[],"score":13.7743,"section":"Service Fees and Reconnection Charges","signals":{"bm25":0.5251,"coverage":1.0,"phrase":0.7653,"window":0.9419},"statements":[{"end":"2026-03-01","expression":"March 1, 2026","granularity":"day","role":"effective","start":"2026-03-01","text":"This fee schedule is effective March 1, 2026."}],"support":0.798963,"supporting":true,"terms":{"after":2.3317,"fee":1.948,"non":1.5883,"off":1.1811,"payment":1.7496,"reconnect":3.2422,"shut":1.1811,"water":0.5525},"text":"Service Fees and Reconnection Charges\n\nThis fee schedule is effective March 1, 2026. These one-time charges are added to the next bill of\nthe account that requested or caused the work.\n\nReconnection fee after a shutoff\n\nWhen service has been shut off for non-payment, the account must be brought current or placed on a\npayment arrangement before we restore water. The reconnection fee is $45.00 during business hours and\n$120.00 for a same-day reconnection after 4:30 p.m. or on weekends. Reconnection normally happens within\none business day of payment.\n\nOther service fees\n\n- Returned payment fee (bounced check or declined bank draft): $25.00\n- Meter test: if you think your meter is wrong, a meter test costs $60.00, refunded if the meter is\n  found to over-register\n- Copies of account records older than two years: $30.00 per request\n- Tampering with a locked meter: $250.00 plus the cost of repairs"},{"answer_type":null,"answer_type_found":true,"as_of":"2025-07-10","as_of_source":"metadata","document":"billing/landlord-accounts.html","expires":null,"fresh":true,"owner":"Billing","page":null,"passage":1,"rank":2,"reasons":[],"score":3.6175,"section":"Accounts for Landlords and Property Managers","signals":{"bm25":0.1379,"coverage":0.3066,"phrase":0.1431,"window":0.3066},"statements":[],"support":0.223306,"supporting":false,"terms":{"off":1.301,"shut":1.301,"water":1.0154},"text":"Accounts for Landlords and Property Managers\n\nOwners of rental property can choose who receives the water bill, and can make sure the water stays on between tenants.\n\nWhose name is on the account\n\nA tenant may open the account in their own name, or the landlord may keep the account in the owner''s name and pass the cost on through the lease. For buildings with one shared meter, the account must stay in the owner''s name. Tell us which arrangement you want on the landlord enrollment form.\n\nLandlord continuity of service\n\nWith a continuity agreement, the account moves to the landlord''s name automatically when a tenant closes an account, so the water is never shut off at a vacant rental. The landlord receives a notice by mail or e-mail each time a tenant closes an account, and the landlord pays only the base charge and any usage during the vacancy."},{"answer_type":null,"answer_type_found":true,"as_of":"2026-05-19","as_of_source":"metadata","document":"billing/payment-arrangements.md","expires":null,"fresh":true,"owner":"Billing","page":null,"passage":7,"rank":3,"reasons":[],"score":2.7689,"section":"Payment Plans for Past-Due Balances","signals":{"bm25":0.1056,"coverage":0.1921,"phrase":0.0,"window":0.096},"statements":[],"support":0.108495,"supporting":false,"terms":{"fee":1.0505,"payment":1.7184},"text":"Payment Plans for Past-Due Balances\n\nIf you have fallen behind, a payment plan spreads a past-due balance over several months so you can\ncatch up without losing service.\n\nHow to set up a payment plan\n\nCall Customer Care at 555-0100 or visit the Customer Service Office. We will agree a plan of up to\ntwelve monthly installments. Each installment is added to your regular monthly bill. You do not need\nto pay anything up front to set up a plan.\n\nKeeping to the plan\n\nAs long as each bill, including the installment, is paid by its due date, no late fees are charged\nand no collection action is taken. If you miss an installment, call us before the next due date and\nwe will try to adjust the plan once."}],"flags":[],"horizon_days":365,"id":"q33","missing_terms":[],"owner":"Billing","question":"What is the reconnection fee after my water is shut off for non-payment?","reasons":[],"support":0.799,"terms":["reconnect","fee","after","water","shut","off","non","payment"],"topic":"fees","verdict":"covered","weight":26.0}');
INSERT INTO "results" VALUES(1,7,'q34','covered',7.0,'{"action":null,"evidence":[{"answer_type":"amount","answer_type_found":true,"as_of":"2026-03-01","as_of_source":"statement","document":"billing/rates-service-fees.md","expires":null,"fresh":true,"owner":"Billing","page":null,"passage":9,"rank":1,"reasons":[],"score":7.7044,"section":"Service Fees and Reconnection Charges","signals":{"bm25":0.36,"coverage":0.7862,"phrase":0.6506,"window":0.7862},"statements":[{"end":"2026-03-01","expression":"March 1, 2026","granularity":"day","role":"effective","start":"2026-03-01","text":"This fee schedule is effective March 1, 2026."}],"support":0.631235,"supporting":true,"terms":{"cost":1.3401,"meter":0.8561,"test":2.3317,"think":1.5883,"wrong":1.5883},"text":"Service Fees and Reconnection Charges\n\nThis fee schedule is effective March 1, 2026. These one-time charges are added to the next bill of\nthe account that requested or caused the work.\n\nReconnection fee after a shutoff\n\nWhen service has been shut off for non-payment, the account must be brought current or placed on a\npayment arrangement before we restore water. The reconnection fee is $45.00 during business hours and\n$120.00 for a same-day reconnection after 4:30 p.m. or on weekends. Reconnection normally happens within\none business day of payment.\n\nOther service fees\n\n- Returned payment fee (bounced check or declined bank draft): $25.00\n- Meter test: if you think your meter is wrong, a meter test costs $60.00, refunded if the meter is\n  found to over-register\n- Copies of account records older than two years: $30.00 per request\n- Tampering with a locked meter: $250.00 plus the cost of repairs"},{"answer_type":"amount","answer_type_found":false,"as_of":"2026-02-20","as_of_source":"metadata","document":"billing/rates-service-fees.md","expires":null,"fresh":true,"owner":"Billing","page":null,"passage":10,"rank":2,"reasons":[],"score":1.952,"section":"Service Fees and Reconnection Charges › Where the money goes","signals":{"bm25":0.0912,"coverage":0.1177,"phrase":0.0,"window":0.1177},"statements":[],"support":0.077598,"supporting":false,"terms":{"cost":1.952},"text":"Where the money goes\n\nFees recover the cost of the truck roll, the technician''s time and the paperwork, so that these\ncosts are paid by the customers who cause them rather than by all members through the base charge."},{"answer_type":"amount","answer_type_found":true,"as_of":"2025-07-10","as_of_source":"metadata","document":"billing/landlord-accounts.html","expires":null,"fresh":true,"owner":"Billing","page":null,"passage":1,"rank":3,"reasons":[],"score":1.4675,"section":"Accounts for Landlords and Property Managers","signals":{"bm25":0.0686,"coverage":0.1718,"phrase":0.0,"window":0.1718},"statements":[],"support":0.10647,"supporting":false,"terms":{"cost":1.0056,"meter":0.462},"text":"Accounts for Landlords and Property Managers\n\nOwners of rental property can choose who receives the water bill, and can make sure the water stays on between tenants.\n\nWhose name is on the account\n\nA tenant may open the account in their own name, or the landlord may keep the account in the owner''s name and pass the cost on through the lease. For buildings with one shared meter, the account must stay in the owner''s name. Tell us which arrangement you want on the landlord enrollment form.\n\nLandlord continuity of service\n\nWith a continuity agreement, the account moves to the landlord''s name automatically when a tenant closes an account, so the water is never shut off at a vacant rental. The landlord receives a notice by mail or e-mail each time a tenant closes an account, and the landlord pays only the base charge and any usage during the vacancy."}],"flags":[],"horizon_days":365,"id":"q34","missing_terms":["much"],"owner":"Billing","question":"How much does a meter test cost if I think my meter is wrong?","reasons":[],"support":0.6312,"terms":["much","meter","test","cost","think","wrong"],"topic":"fees","verdict":"covered","weight":7.0}');
INSERT INTO "results" VALUES(2,0,'q01','covered',96.0,'{"action":null,"evidence":[{"answer_type":"amount","answer_type_found":true,"as_of":"2025-07-01","as_of_source":"statement","document":"billing/rates-2025-26.md","expires":null,"fresh":false,"owner":"Billing","page":null,"passage":3,"rank":1,"reasons":["too_old"],"score":10.3291,"section":"Residential Water Rates 2025–26","signals":{"bm25":0.5938,"coverage":0.737,"phrase":0.772,"window":0.737},"statements":[{"end":"2026-06-30","expression":"2025–26","granularity":"year","role":"period","start":"2025-07-01","text":"Residential Water Rates 2025–26"},{"end":"2025-07-01","expression":"July 1, 2025","granularity":"day","role":"effective","start":"2025-07-01","text":"These rates are effective July 1, 2025, as approved by the Fernhollow Water Cooperative board of directors for single-family and duplex residential accounts."}],"support":0.701043,"supporting":true,"terms":{"base":1.6254,"charg":0.6731,"inch":2.4794,"meter":1.2925,"month":1.4958,"residenti":2.7628},"text":"Residential Water Rates 2025–26\n\nThese rates are effective July 1, 2025, as approved by the Fernhollow Water Cooperative board of\ndirectors for single-family and duplex residential accounts.\n\nMonthly base charge\n\nEach residential account pays a monthly base charge based on the size of its water meter. The base\ncharge pays for meter reading, billing and maintenance of the distribution pipes. With the usual\n5/8-inch residential meter the monthly base charge is $19.85.\n\n| Meter size | Monthly base charge |\n|---|---|\n| 5/8-inch residential meter | $19.85 |\n| 3/4-inch residential meter | $25.20 |\n| 1-inch residential meter | $35.90 |"},{"answer_type":"amount","answer_type_found":true,"as_of":"2026-07-01","as_of_source":"statement","document":"billing/rates-2026-27.md","expires":null,"fresh":true,"owner":"Billing","page":null,"passage":5,"rank":2,"reasons":[],"score":9.9029,"section":"Residential Water Rates 2026–27","signals":{"bm25":0.5693,"coverage":0.737,"phrase":0.772,"window":0.737},"statements":[{"end":"2027-06-30","expression":"2026–27","granularity":"year","role":"period","start":"2026-07-01","text":"Residential Water Rates 2026–27"},{"end":"2026-07-01","expression":"July 1, 2026","granularity":"day","role":"effective","start":"2026-07-01","text":"These rates are effective July 1, 2026, as approved by the Fernhollow Water Cooperative board of directors."}],"support":0.693693,"supporting":true,"terms":{"base":1.5038,"charg":0.6444,"inch":2.3542,"meter":1.3023,"month":1.5038,"residenti":2.5944},"text":"Residential Water Rates 2026–27\n\nThese rates are effective July 1, 2026, as approved by the Fernhollow Water Cooperative board of\ndirectors. They apply to every single-family and duplex residential account inside the service area.\n\nMonthly base charge\n\nEvery residential account pays a monthly base charge that depends on the size of the water meter.\nThe base charge covers meter reading, billing and the upkeep of the pipes that bring water to your\nstreet, whether or not you use any water that month.\n\n| Meter size | Monthly base charge |\n|---|---|\n| 5/8-inch residential meter | $21.40 |\n| 3/4-inch residential meter | $27.10 |\n| 1-inch residential meter | $38.60 |\n\nMost homes have a 5/8-inch meter, so for most homes the monthly base charge is $21.40. The meter size is printed on your bill next to your meter number."},{"answer_type":"amount","answer_type_found":true,"as_of":"2026-06-20","as_of_source":"metadata","document":"billing/rates-2026-27.md","expires":null,"fresh":true,"owner":"Billing","page":null,"passage":6,"rank":3,"reasons":[],"score":2.1867,"section":"Residential Water Rates 2026–27","signals":{"bm25":0.1257,"coverage":0.2492,"phrase":0.0979,"window":0.2492},"statements":[],"support":0.181877,"supporting":false,"terms":{"base":0.8706,"charg":0.6409,"meter":0.6752},"text":"Usage charge per 1,000 gallons\n\nOn top of the base charge you pay a usage charge for each 1,000 gallons of water that passes through\nyour meter. The price per 1,000 gallons rises in tiers, so that essential indoor use stays affordable:\n\n- Tier 1, the first 4,000 gallons: $4.15 per 1,000 gallons\n- Tier 2, 4,001 to 12,000 gallons: $5.80 per 1,000 gallons\n- Tier 3, above 12,000 gallons: $7.95 per 1,000 gallons\n\nQuestions about your rates\n\nBilling can explain how your charges were calculated. Call Customer Care at 555-0100 or write to\nbilling@fernhollow-water.example."}],"flags":["stale_competitor"],"horizon_days":365,"id":"q01","missing_terms":["much"],"owner":"Billing","question":"How much is the monthly base charge for a 5/8-inch residential meter?","reasons":[],"support":0.6937,"terms":["much","month","base","charg","inch","residenti","meter"],"topic":"rates","verdict":"covered","weight":96.0}');
INSERT INTO "results" VALUES(2,1,'q02','covered',74.0,'{"action":null,"evidence":[{"answer_type":null,"answer_type_found":true,"as_of":"2025-06-18","as_of_source":"metadata","document":"billing/rates-2025-26.md","expires":null,"fresh":false,"owner":"Billing","page":null,"passage":4,"rank":1,"reasons":["too_old"],"score":10.4491,"section":"Residential Water Rates 2025–26","signals":{"bm25":0.7952,"coverage":1.0,"phrase":1.0,"window":1.0},"statements":[],"support":0.938555,"supporting":true,"terms":{"000":2.9344,"charg":0.5992,"gallon":2.959,"per":1.931,"usag":2.0254},"text":"Usage charge per 1,000 gallons\n\nThe usage charge is billed for each 1,000 gallons recorded by your meter, in three tiers:\n\n- Tier 1, the first 4,000 gallons: $3.90 per 1,000 gallons\n- Tier 2, 4,001 to 12,000 gallons: $5.45 per 1,000 gallons\n- Tier 3, above 12,000 gallons: $7.40 per 1,000 gallons\n\nHow the tiers work\n\nOnly the gallons inside each tier are charged at that tier''s price. A household that uses 6,000\ngallons in one billing period pays the Tier 1 price for the first 4,000 gallons and the Tier 2 price for the\nremaining 2,000 gallons."},{"answer_type":null,"answer_type_found":true,"as_of":"2026-06-20","as_of_source":"metadata","document":"billing/rates-2026-27.md","expires":null,"fresh":true,"owner":"Billing","page":null,"passage":6,"rank":2,"reasons":[],"score":10.3734,"section":"Residential Water Rates 2026–27","signals":{"bm25":0.7894,"coverage":1.0,"phrase":1.0,"window":1.0},"statements":[],"support":0.936828,"supporting":true,"terms":{"000":2.8596,"charg":0.6409,"gallon":2.8596,"per":2.0127,"usag":2.0006},"text":"Usage charge per 1,000 gallons\n\nOn top of the base charge you pay a usage charge for each 1,000 gallons of water that passes through\nyour meter. The price per 1,000 gallons rises in tiers, so that essential indoor use stays affordable:\n\n- Tier 1, the first 4,000 gallons: $4.15 per 1,000 gallons\n- Tier 2, 4,001 to 12,000 gallons: $5.80 per 1,000 gallons\n- Tier 3, above 12,000 gallons: $7.95 per 1,000 gallons\n\nQuestions about your rates\n\nBilling can explain how your charges were calculated. Call Customer Care at 555-0100 or write to\nbilling@fernhollow-water.example."},{"answer_type":null,"answer_type_found":true,"as_of":"2026-03-01","as_of_source":"statement","document":"billing/rates-service-fees.md","expires":null,"fresh":false,"owner":"Billing","page":null,"passage":9,"rank":3,"reasons":["too_old"],"score":1.3649,"section":"Service Fees and Reconnection Charges","signals":{"bm25":0.1039,"coverage":0.2558,"phrase":0.0,"window":0.1917},"statements":[{"end":"2026-03-01","expression":"March 1, 2026","granularity":"day","role":"effective","start":"2026-03-01","text":"This fee schedule is effective March 1, 2026."}],"support":0.146259,"supporting":false,"terms":{"charg":0.4492,"per":0.9157},"text":"Service Fees and Reconnection Charges\n\nThis fee schedule is effective March 1, 2026. These one-time charges are added to the next bill of\nthe account that requested or caused the work.\n\nReconnection fee after a shutoff\n\nWhen service has been shut off for non-payment, the account must be brought current or placed on a\npayment arrangement before we restore water. The reconnection fee is $45.00 during business hours and\n$120.00 for a same-day reconnection after 4:30 p.m. or on weekends. Reconnection normally happens within\none business day of payment.\n\nOther service fees\n\n- Returned payment fee (bounced check or declined bank draft): $25.00\n- Meter test: if you think your meter is wrong, a meter test costs $60.00, refunded if the meter is\n  found to over-register\n- Copies of account records older than two years: $30.00 per request\n- Tampering with a locked meter: $250.00 plus the cost of repairs"}],"flags":["stale_competitor"],"horizon_days":365,"id":"q02","missing_terms":[],"owner":"Billing","question":"What is the usage charge per 1,000 gallons?","reasons":[],"support":0.9368,"terms":["usag","charg","per","000","gallon"],"topic":"rates","verdict":"covered","weight":74.0}');
INSERT INTO "results" VALUES(2,2,'q03','covered',88.0,'{"action":null,"evidence":[{"answer_type":null,"answer_type_found":true,"as_of":"2026-09-08","as_of_source":"metadata","document":"billing/payment-options.html","expires":null,"fresh":true,"owner":"Billing","page":null,"passage":11,"rank":1,"reasons":[],"score":4.794,"section":"Ways to Pay Your Bill","signals":{"bm25":0.7149,"coverage":1.0,"phrase":0.4251,"window":0.8274},"statements":[],"support":0.764972,"supporting":true,"terms":{"bill":0.2441,"pay":0.726,"phone":3.3174,"water":0.5065},"text":"Ways to Pay Your Bill\n\nYou can pay your water bill in several ways. Whichever you choose, have your account number ready; it is printed at the top of every bill.\n\nPay online\n\nUse the member portal to pay with a debit card, credit card or a one-time bank transfer. Online payments are free and post to your account the same business day.\n\nPay by phone\n\nCall the automated pay-by-phone line at 555-0142, available 24 hours a day, and follow the prompts to pay your bill by card or bank account. To pay by phone with help from a person, call Customer Care at 555-0100 during office hours. There is no fee for phone payments."},{"answer_type":null,"answer_type_found":true,"as_of":"2025-07-01","as_of_source":"statement","document":"billing/rates-2025-26.md","expires":null,"fresh":false,"owner":"Billing","page":null,"passage":3,"rank":2,"reasons":["too_old"],"score":1.4753,"section":"Residential Water Rates 2025–26","signals":{"bm25":0.22,"coverage":0.3463,"phrase":0.0,"window":0.2982},"statements":[{"end":"2026-06-30","expression":"2025–26","granularity":"year","role":"period","start":"2025-07-01","text":"Residential Water Rates 2025–26"},{"end":"2025-07-01","expression":"July 1, 2025","granularity":"day","role":"effective","start":"2025-07-01","text":"These rates are effective July 1, 2025, as approved by the Fernhollow Water Cooperative board of directors for single-family and duplex residential accounts."}],"support":0.229551,"supporting":false,"terms":{"bill":0.1428,"pay":0.5171,"water":0.8153},"text":"Residential Water Rates 2025–26\n\nThese rates are effective July 1, 2025, as approved by the Fernhollow Water Cooperative board of\ndirectors for single-family and duplex residential accounts.\n\nMonthly base charge\n\nEach residential account pays a monthly base charge based on the size of its water meter. The base\ncharge pays for meter reading, billing and maintenance of the distribution pipes. With the usual\n5/8-inch residential meter the monthly base charge is $19.85.\n\n| Meter size | Monthly base charge |\n|---|---|\n| 5/8-inch residential meter | $19.85 |\n| 3/4-inch residential meter | $25.20 |\n| 1-inch residential meter | $35.90 |"},{"answer_type":null,"answer_type_found":true,"as_of":"2026-09-08","as_of_source":"metadata","document":"billing/payment-options.html","expires":null,"fresh":true,"owner":"Billing","page":null,"passage":12,"rank":3,"reasons":[],"score":1.4025,"section":"Ways to Pay Your Bill","signals":{"bm25":0.2092,"coverage":0.3463,"phrase":0.0,"window":0.3463},"statements":[],"support":0.235916,"supporting":false,"terms":{"bill":0.2055,"pay":0.6559,"water":0.5412},"text":"Pay by mail\n\nSend a check or money order payable to Fernhollow Water Cooperative, with the payment stub from your bill, to PO Box 2210, Fernhollow. Allow five to seven days for mailed payments to arrive.\n\nPay in person\n\nPay in person with cash, check or card at the Customer Service Office, 410 Millrace Road, Fernhollow, Monday to Friday, 8 a.m. to 5 p.m. A drop box beside the front door takes checks at any hour. You can also pay cash at any Northgate Market customer service desk; bring your bill so the cashier can scan the barcode."}],"flags":[],"horizon_days":365,"id":"q03","missing_terms":[],"owner":"Billing","question":"How can I pay my water bill by phone?","reasons":[],"support":0.765,"terms":["pay","water","bill","phone"],"topic":"payments","verdict":"covered","weight":88.0}');
INSERT INTO "results" VALUES(2,3,'q04','covered',41.0,'{"action":null,"evidence":[{"answer_type":"place","answer_type_found":true,"as_of":"2026-09-08","as_of_source":"metadata","document":"billing/payment-options.html","expires":null,"fresh":true,"owner":"Billing","page":null,"passage":12,"rank":1,"reasons":[],"score":5.7314,"section":"Ways to Pay Your Bill","signals":{"bm25":0.6507,"coverage":1.0,"phrase":0.6169,"window":0.9634},"statements":[],"support":0.811258,"supporting":true,"terms":{"bill":0.2055,"cash":2.793,"pay":0.6559,"person":2.077},"text":"Pay by mail\n\nSend a check or money order payable to Fernhollow Water Cooperative, with the payment stub from your bill, to PO Box 2210, Fernhollow. Allow five to seven days for mailed payments to arrive.\n\nPay in person\n\nPay in person with cash, check or card at the Customer Service Office, 410 Millrace Road, Fernhollow, Monday to Friday, 8 a.m. to 5 p.m. A drop box beside the front door takes checks at any hour. You can also pay cash at any Northgate Market customer service desk; bring your bill so the cashier can scan the barcode."},{"answer_type":"place","answer_type_found":true,"as_of":"2026-09-08","as_of_source":"metadata","document":"billing/payment-options.html","expires":null,"fresh":true,"owner":"Billing","page":null,"passage":11,"rank":2,"reasons":[],"score":2.3964,"section":"Ways to Pay Your Bill","signals":{"bm25":0.2721,"coverage":0.5023,"phrase":0.094,"window":0.5023},"statements":[],"support":0.351601,"supporting":false,"terms":{"bill":0.2441,"pay":0.726,"person":1.4264},"text":"Ways to Pay Your Bill\n\nYou can pay your water bill in several ways. Whichever you choose, have your account number ready; it is printed at the top of every bill.\n\nPay online\n\nUse the member portal to pay with a debit card, credit card or a one-time bank transfer. Online payments are free and post to your account the same business day.\n\nPay by phone\n\nCall the automated pay-by-phone line at 555-0142, available 24 hours a day, and follow the prompts to pay your bill by card or bank account. To pay by phone with help from a person, call Customer Care at 555-0100 during office hours. There is no fee for phone payments."},{"answer_type":"place","answer_type_found":false,"as_of":"2025-07-01","as_of_source":"statement","document":"billing/rates-2025-26.md","expires":null,"fresh":false,"owner":"Billing","page":null,"passage":3,"rank":3,"reasons":["too_old"],"score":0.6599,"section":"Residential Water Rates 2025–26","signals":{"bm25":0.0749,"coverage":0.1323,"phrase":0.0,"window":0.1323},"statements":[{"end":"2026-06-30","expression":"2025–26","granularity":"year","role":"period","start":"2025-07-01","text":"Residential Water Rates 2025–26"},{"end":"2025-07-01","expression":"July 1, 2025","granularity":"day","role":"effective","start":"2025-07-01","text":"These rates are effective July 1, 2025, as approved by the Fernhollow Water Cooperative board of directors for single-family and duplex residential accounts."}],"support":0.079756,"supporting":false,"terms":{"bill":0.1428,"pay":0.5171},"text":"Residential Water Rates 2025–26\n\nThese rates are effective July 1, 2025, as approved by the Fernhollow Water Cooperative board of\ndirectors for single-family and duplex residential accounts.\n\nMonthly base charge\n\nEach residential account pays a monthly base charge based on the size of its water meter. The base\ncharge pays for meter reading, billing and maintenance of the distribution pipes. With the usual\n5/8-inch residential meter the monthly base charge is $19.85.\n\n| Meter size | Monthly base charge |\n|---|---|\n| 5/8-inch residential meter | $19.85 |\n| 3/4-inch residential meter | $25.20 |\n| 1-inch residential meter | $35.90 |"}],"flags":[],"horizon_days":365,"id":"q04","missing_terms":[],"owner":"Billing","question":"Where can I pay my bill in person with cash?","reasons":[],"support":0.8113,"terms":["pay","bill","person","cash"],"topic":"payments","verdict":"covered","weight":41.0}');
INSERT INTO "results" VALUES(2,4,'q14','gap',18.0,'{"action":"write","evidence":[{"answer_type":null,"answer_type_found":true,"as_of":"2025-07-01","as_of_source":"statement","document":"billing/rates-2025-26.md","expires":null,"fresh":true,"owner":"Billing","page":null,"passage":3,"rank":1,"reasons":[],"score":2.0223,"section":"Residential Water Rates 2025–26","signals":{"bm25":0.0784,"coverage":0.121,"phrase":0.0,"window":0.121},"statements":[{"end":"2026-06-30","expression":"2025–26","granularity":"year","role":"period","start":"2025-07-01","text":"Residential Water Rates 2025–26"},{"end":"2025-07-01","expression":"July 1, 2025","granularity":"day","role":"effective","start":"2025-07-01","text":"These rates are effective July 1, 2025, as approved by the Fernhollow Water Cooperative board of directors for single-family and duplex residential accounts."}],"support":0.084033,"supporting":false,"terms":{"account":1.2069,"water":0.8153},"text":"Residential Water Rates 2025–26\n\nThese rates are effective July 1, 2025, as approved by the Fernhollow Water Cooperative board of\ndirectors for single-family and duplex residential accounts.\n\nMonthly base charge\n\nEach residential account pays a monthly base charge based on the size of its water meter. The base\ncharge pays for meter reading, billing and maintenance of the distribution pipes. With the usual\n5/8-inch residential meter the monthly base charge is $19.85.\n\n| Meter size | Monthly base charge |\n|---|---|\n| 5/8-inch residential meter | $19.85 |\n| 3/4-inch residential meter | $25.20 |\n| 1-inch residential meter | $35.90 |"},{"answer_type":null,"answer_type_found":true,"as_of":"2026-07-01","as_of_source":"statement","document":"billing/rates-2026-27.md","expires":null,"fresh":true,"owner":"Billing","page":null,"passage":5,"rank":2,"reasons":[],"score":1.9967,"section":"Residential Water Rates 2026–27","signals":{"bm25":0.0774,"coverage":0.121,"phrase":0.0,"window":0.121},"statements":[{"end":"2027-06-30","expression":"2026–27","granularity":"year","role":"period","start":"2026-07-01","text":"Residential Water Rates 2026–27"},{"end":"2026-07-01","expression":"July 1, 2026","granularity":"day","role":"effective","start":"2026-07-01","text":"These rates are effective July 1, 2026, as approved by the Fernhollow Water Cooperative board of directors."}],"support":0.083735,"supporting":false,"terms":{"account":1.1115,"water":0.8851},"text":"Residential Water Rates 2026–27\n\nThese rates are effective July 1, 2026, as approved by the Fernhollow Water Cooperative board of\ndirectors. They apply to every single-family and duplex residential account inside the service area.\n\nMonthly base charge\n\nEvery residential account pays a monthly base charge that depends on the size of the water meter.\nThe base charge covers meter reading, billing and the upkeep of the pipes that bring water to your\nstreet, whether or not you use any water that month.\n\n| Meter size | Monthly base charge |\n|---|---|\n| 5/8-inch residential meter | $21.40 |\n| 3/4-inch residential meter | $27.10 |\n| 1-inch residential meter | $38.60 |\n\nMost homes have a 5/8-inch meter, so for most homes the monthly base charge is $21.40. The meter size is printed on your bill next to your meter number."},{"answer_type":null,"answer_type_found":true,"as_of":"2026-09-08","as_of_source":"metadata","document":"billing/payment-options.html","expires":null,"fresh":true,"owner":"Billing","page":null,"passage":11,"rank":3,"reasons":[],"score":1.8831,"section":"Ways to Pay Your Bill","signals":{"bm25":0.073,"coverage":0.121,"phrase":0.0,"window":0.121},"statements":[],"support":0.082416,"supporting":false,"terms":{"account":1.3766,"water":0.5065},"text":"Ways to Pay Your Bill\n\nYou can pay your water bill in several ways. Whichever you choose, have your account number ready; it is printed at the top of every bill.\n\nPay online\n\nUse the member portal to pay with a debit card, credit card or a one-time bank transfer. Online payments are free and post to your account the same business day.\n\nPay by phone\n\nCall the automated pay-by-phone line at 555-0142, available 24 hours a day, and follow the prompts to pay your bill by card or bank account. To pay by phone with help from a person, call Customer Care at 555-0100 during office hours. There is no fee for phone payments."}],"flags":[],"horizon_days":730,"id":"q14","missing_terms":["landlord","name","between","tenant"],"owner":"Billing","question":"As a landlord, can I keep the water account in my name between tenants?","reasons":[],"support":0.084,"terms":["landlord","keep","water","account","name","between","tenant"],"topic":"landlord","verdict":"gap","weight":18.0}');
INSERT INTO "results" VALUES(2,5,'q15','gap',9.0,'{"action":"write","evidence":[{"answer_type":null,"answer_type_found":true,"as_of":"2026-09-08","as_of_source":"metadata","document":"billing/payment-options.html","expires":null,"fresh":true,"owner":"Billing","page":null,"passage":11,"rank":1,"reasons":[],"score":1.3766,"section":"Ways to Pay Your Bill","signals":{"bm25":0.0554,"coverage":0.0792,"phrase":0.0,"window":0.0792},"statements":[],"support":0.056207,"supporting":false,"terms":{"account":1.3766},"text":"Ways to Pay Your Bill\n\nYou can pay your water bill in several ways. Whichever you choose, have your account number ready; it is printed at the top of every bill.\n\nPay online\n\nUse the member portal to pay with a debit card, credit card or a one-time bank transfer. Online payments are free and post to your account the same business day.\n\nPay by phone\n\nCall the automated pay-by-phone line at 555-0142, available 24 hours a day, and follow the prompts to pay your bill by card or bank account. To pay by phone with help from a person, call Customer Care at 555-0100 during office hours. There is no fee for phone payments."},{"answer_type":null,"answer_type_found":true,"as_of":"2026-03-01","as_of_source":"statement","document":"billing/rates-service-fees.md","expires":null,"fresh":true,"owner":"Billing","page":null,"passage":9,"rank":2,"reasons":[],"score":1.2416,"section":"Service Fees and Reconnection Charges","signals":{"bm25":0.05,"coverage":0.0792,"phrase":0.0,"window":0.0792},"statements":[{"end":"2026-03-01","expression":"March 1, 2026","granularity":"day","role":"effective","start":"2026-03-01","text":"This fee schedule is effective March 1, 2026."}],"support":0.054576,"supporting":false,"terms":{"account":1.2416},"text":"Service Fees and Reconnection Charges\n\nThis fee schedule is effective March 1, 2026. These one-time charges are added to the next bill of\nthe account that requested or caused the work.\n\nReconnection fee after a shutoff\n\nWhen service has been shut off for non-payment, the account must be brought current or placed on a\npayment arrangement before we restore water. The reconnection fee is $45.00 during business hours and\n$120.00 for a same-day reconnection after 4:30 p.m. or on weekends. Reconnection normally happens within\none business day of payment.\n\nOther service fees\n\n- Returned payment fee (bounced check or declined bank draft): $25.00\n- Meter test: if you think your meter is wrong, a meter test costs $60.00, refunded if the meter is\n  found to over-register\n- Copies of account records older than two years: $30.00 per request\n- Tampering with a locked meter: $250.00 plus the cost of repairs"},{"answer_type":null,"answer_type_found":true,"as_of":"2025-07-01","as_of_source":"statement","document":"billing/rates-2025-26.md","expires":null,"fresh":true,"owner":"Billing","page":null,"passage":3,"rank":3,"reasons":[],"score":1.2069,"section":"Residential Water Rates 2025–26","signals":{"bm25":0.0486,"coverage":0.0792,"phrase":0.0,"window":0.0792},"statements":[{"end":"2026-06-30","expression":"2025–26","granularity":"year","role":"period","start":"2025-07-01","text":"Residential Water Rates 2025–26"},{"end":"2025-07-01","expression":"July 1, 2025","granularity":"day","role":"effective","start":"2025-07-01","text":"These rates are effective July 1, 2025, as approved by the Fernhollow Water Cooperative board of directors for single-family and duplex residential accounts."}],"support":0.054157,"supporting":false,"terms":{"account":1.2069},"text":"Residential Water Rates 2025–26\n\nThese rates are effective July 1, 2025, as approved by the Fernhollow Water Cooperative board of\ndirectors for single-family and duplex residential accounts.\n\nMonthly base charge\n\nEach residential account pays a monthly base charge based on the size of its water meter. The base\ncharge pays for meter reading, billing and maintenance of the distribution pipes. With the usual\n5/8-inch residential meter the monthly base charge is $19.85.\n\n| Meter size | Monthly base charge |\n|---|---|\n| 5/8-inch residential meter | $19.85 |\n| 3/4-inch residential meter | $25.20 |\n| 1-inch residential meter | $35.90 |"}],"flags":[],"horizon_days":730,"id":"q15","missing_terms":["landlord","receiv","notic","tenant","close"],"owner":"Billing","question":"Do landlords receive a notice when a tenant closes their account?","reasons":[],"support":0.0562,"terms":["landlord","receiv","notic","tenant","close","account"],"topic":"landlord","verdict":"gap","weight":9.0}');
INSERT INTO "results" VALUES(2,6,'q33','stale',26.0,'{"action":"refresh","evidence":[{"answer_type":null,"answer_type_found":true,"as_of":"2026-03-01","as_of_source":"statement","document":"billing/rates-service-fees.md","expires":null,"fresh":false,"owner":"Billing","page":null,"passage":9,"rank":1,"reasons":["too_old"],"score":13.3666,"section":"Service Fees and Reconnection Charges","signals":{"bm25":0.5032,"coverage":1.0,"phrase":0.7653,"window":0.9564},"statements":[{"end":"2026-03-01","expression":"March 1, 2026","granularity":"day","role":"effective","start":"2026-03-01","text":"This fee schedule is effective March 1, 2026."}],"support":0.795301,"supporting":true,"terms":{"after":2.337,"fee":1.5221,"non":1.5933,"off":1.5933,"payment":1.0606,"reconnect":3.2464,"shut":1.5933,"water":0.4207},"text":"Service Fees and Reconnection Charges\n\nThis fee schedule is effective March 1, 2026. These one-time charges are added to the next bill of\nthe account that requested or caused the work.\n\nReconnection fee after a shutoff\n\nWhen service has been shut off for non-payment, the account must be brought current or placed on a\npayment arrangement before we restore water. The reconnection fee is $45.00 during business hours and\n$120.00 for a same-day reconnection after 4:30 p.m. or on weekends. Reconnection normally happens within\none business day of payment.\n\nOther service fees\n\n- Returned payment fee (bounced check or declined bank draft): $25.00\n- Meter test: if you think your meter is wrong, a meter test costs $60.00, refunded if the meter is\n  found to over-register\n- Copies of account records older than two years: $30.00 per request\n- Tampering with a locked meter: $250.00 plus the cost of repairs"},{"answer_type":null,"answer_type_found":true,"as_of":"2026-09-08","as_of_source":"metadata","document":"billing/payment-options.html","expires":null,"fresh":true,"owner":"Billing","page":null,"passage":11,"rank":2,"reasons":[],"score":2.2953,"section":"Ways to Pay Your Bill","signals":{"bm25":0.0864,"coverage":0.175,"phrase":0.0,"window":0.1314},"statements":[],"support":0.104703,"supporting":false,"terms":{"fee":0.8605,"payment":0.9284,"water":0.5065},"text":"Ways to Pay Your Bill\n\nYou can pay your water bill in several ways. Whichever you choose, have your account number ready; it is printed at the top of every bill.\n\nPay online\n\nUse the member portal to pay with a debit card, credit card or a one-time bank transfer. Online payments are free and post to your account the same business day.\n\nPay by phone\n\nCall the automated pay-by-phone line at 555-0142, available 24 hours a day, and follow the prompts to pay your bill by card or bank account. To pay by phone with help from a person, call Customer Care at 555-0100 during office hours. There is no fee for phone payments."},{"answer_type":null,"answer_type_found":true,"as_of":"2026-05-19","as_of_source":"metadata","document":"billing/payment-arrangements.md","expires":null,"fresh":true,"owner":"Billing","page":null,"passage":7,"rank":3,"reasons":[],"score":1.8639,"section":"Payment Plans for Past-Due Balances","signals":{"bm25":0.0702,"coverage":0.1314,"phrase":0.0,"window":0.074},"statements":[],"support":0.075279,"supporting":false,"terms":{"fee":0.8222,"payment":1.0417},"text":"Payment Plans for Past-Due Balances\n\nIf you have fallen behind, a payment plan spreads a past-due balance over several months so you can\ncatch up without losing service.\n\nHow to set up a payment plan\n\nCall Customer Care at 555-0100 or visit the Customer Service Office. We will agree a plan of up to\ntwelve monthly installments. Each installment is added to your regular monthly bill. You do not need\nto pay anything up front to set up a plan.\n\nKeeping to the plan\n\nAs long as each bill, including the installment, is paid by its due date, no late fees are charged\nand no collection action is taken. If you miss an installment, call us before the next due date and\nwe will try to adjust the plan once."}],"flags":[],"horizon_days":365,"id":"q33","missing_terms":[],"owner":"Billing","question":"What is the reconnection fee after my water is shut off for non-payment?","reasons":["too_old"],"support":0.7953,"terms":["reconnect","fee","after","water","shut","off","non","payment"],"topic":"fees","verdict":"stale","weight":26.0}');
INSERT INTO "results" VALUES(2,7,'q34','stale',7.0,'{"action":"refresh","evidence":[{"answer_type":"amount","answer_type_found":true,"as_of":"2026-03-01","as_of_source":"statement","document":"billing/rates-service-fees.md","expires":null,"fresh":false,"owner":"Billing","page":null,"passage":9,"rank":1,"reasons":["too_old"],"score":8.3908,"section":"Service Fees and Reconnection Charges","signals":{"bm25":0.3728,"coverage":0.7968,"phrase":0.6486,"window":0.7968},"statements":[{"end":"2026-03-01","expression":"March 1, 2026","granularity":"day","role":"effective","start":"2026-03-01","text":"This fee schedule is effective March 1, 2026."}],"support":0.639936,"supporting":true,"terms":{"cost":1.7379,"meter":1.1294,"test":2.337,"think":1.5933,"wrong":1.5933},"text":"Service Fees and Reconnection Charges\n\nThis fee schedule is effective March 1, 2026. These one-time charges are added to the next bill of\nthe account that requested or caused the work.\n\nReconnection fee after a shutoff\n\nWhen service has been shut off for non-payment, the account must be brought current or placed on a\npayment arrangement before we restore water. The reconnection fee is $45.00 during business hours and\n$120.00 for a same-day reconnection after 4:30 p.m. or on weekends. Reconnection normally happens within\none business day of payment.\n\nOther service fees\n\n- Returned payment fee (bounced check or declined bank draft): $25.00\n- Meter test: if you think your meter is wrong, a meter test costs $60.00, refunded if the meter is\n  found to over-register\n- Copies of account records older than two years: $30.00 per request\n- Tampering with a locked meter: $250.00 plus the cost of repairs"},{"answer_type":"amount","answer_type_found":false,"as_of":"2026-02-20","as_of_source":"metadata","document":"billing/rates-service-fees.md","expires":null,"fresh":false,"owner":"Billing","page":null,"passage":10,"rank":2,"reasons":["too_old"],"score":2.5272,"section":"Service Fees and Reconnection Charges › Where the money goes","signals":{"bm25":0.1123,"coverage":0.1448,"phrase":0.0,"window":0.1448},"statements":[],"support":0.095477,"supporting":false,"terms":{"cost":2.5272},"text":"Where the money goes\n\nFees recover the cost of the truck roll, the technician''s time and the paperwork, so that these\ncosts are paid by the customers who cause them rather than by all members through the base charge."},{"answer_type":"amount","answer_type_found":false,"as_of":"2026-07-01","as_of_source":"statement","document":"billing/rates-2026-27.md","expires":null,"fresh":true,"owner":"Billing","page":null,"passage":5,"rank":3,"reasons":[],"score":1.3023,"section":"Residential Water Rates 2026–27","signals":{"bm25":0.0579,"coverage":0.0677,"phrase":0.0,"window":0.0677},"statements":[{"end":"2027-06-30","expression":"2026–27","granularity":"year","role":"period","start":"2026-07-01","text":"Residential Water Rates 2026–27"},{"end":"2026-07-01","expression":"July 1, 2026","granularity":"day","role":"effective","start":"2026-07-01","text":"These rates are effective July 1, 2026, as approved by the Fernhollow Water Cooperative board of directors."}],"support":0.046108,"supporting":false,"terms":{"meter":1.3023},"text":"Residential Water Rates 2026–27\n\nThese rates are effective July 1, 2026, as approved by the Fernhollow Water Cooperative board of\ndirectors. They apply to every single-family and duplex residential account inside the service area.\n\nMonthly base charge\n\nEvery residential account pays a monthly base charge that depends on the size of the water meter.\nThe base charge covers meter reading, billing and the upkeep of the pipes that bring water to your\nstreet, whether or not you use any water that month.\n\n| Meter size | Monthly base charge |\n|---|---|\n| 5/8-inch residential meter | $21.40 |\n| 3/4-inch residential meter | $27.10 |\n| 1-inch residential meter | $38.60 |\n\nMost homes have a 5/8-inch meter, so for most homes the monthly base charge is $21.40. The meter size is printed on your bill next to your meter number."}],"flags":[],"horizon_days":365,"id":"q34","missing_terms":["much"],"owner":"Billing","question":"How much does a meter test cost if I think my meter is wrong?","reasons":["too_old"],"support":0.6399,"terms":["much","meter","test","cost","think","wrong"],"topic":"fees","verdict":"stale","weight":7.0}');
CREATE TABLE runs (
    id                 INTEGER PRIMARY KEY,
    started            TEXT NOT NULL,
    finished           TEXT,
    status             TEXT NOT NULL DEFAULT 'running',  -- running | done | failed
    as_of              TEXT NOT NULL,
    horizon_days       INTEGER NOT NULL,
    config_fingerprint TEXT NOT NULL DEFAULT '',
    corpus_fingerprint TEXT NOT NULL DEFAULT '',
    thresholds         TEXT NOT NULL DEFAULT '{}',  -- JSON: the support thresholds used
    corpus             TEXT NOT NULL DEFAULT '{}',  -- JSON: results.json run.corpus
    summary            TEXT NOT NULL DEFAULT '{}',  -- JSON: results.json summary
    gate               TEXT,                        -- JSON: gate outcome, when a gate ran
    ingest_errors      TEXT NOT NULL DEFAULT '[]',  -- JSON: results.json ingest_errors at run time
    extras             TEXT NOT NULL DEFAULT '{}'   -- JSON: report-only parts (documents inventory, briefs)
);
INSERT INTO "runs" VALUES(1,'2026-12-03T14:38:11Z','2026-12-03T14:38:11Z','done','2026-06-01',365,'3de54b8995262046','bcbf8615e4557e96','{"source":"default","support":0.45,"weak_margin":0.05}','{"documents":5,"failed":0,"freshness":0.8,"mean_age_days":68.3,"passages":10}','{"covered":6,"fallback_exposure":0.3593314763231198,"gap":2,"questions":8,"stale":0,"stale_exposure":0.0,"weight":359.0}','{"checks":[{"figure":"gap_share","limit":"max_gap_share","max":0.5,"passed":true,"value":0.25},{"figure":"fallback_exposure","limit":"max_fallback_exposure","max":0.5,"passed":true,"value":0.3593314763231198}],"message":"gate passed: gap_share 0.25 <= max 0.50, fallback_exposure 0.36 <= max 0.50","passed":true}','[]','{"briefs":[{"examples":["How can I pay my water bill by phone?","Where can I pay my bill in person with cash?"],"owner":"Billing","questions":["q03","q04"],"terms":["phone","person","cash"],"title":"phone, person, cash (payments)","topic":"payments","weight":129.0}],"documents":[{"as_of":"2025-07-10","doc_date":"2025-07-10","doc_date_source":"og:article:modified_time","expires":null,"fresh":true,"kind":"html","owner":"Billing","passages":2,"path":"billing/landlord-accounts.html","reasons":[],"status":"active","title":"Accounts for Landlords and Property Managers | Fernhollow Water Cooperative"},{"as_of":"2026-05-19","doc_date":"2026-05-19","doc_date_source":"front_matter:updated","expires":null,"fresh":true,"kind":"markdown","owner":"Billing","passages":2,"path":"billing/payment-arrangements.md","reasons":[],"status":"active","title":"Payment Plans for Past-Due Balances"},{"as_of":"2025-06-18","doc_date":"2025-06-18","doc_date_source":"front_matter:updated","expires":null,"fresh":false,"kind":"markdown","owner":"Billing","passages":2,"path":"billing/rates-2025-26.md","reasons":["too_old"],"status":"active","title":"Residential Water Rates 2025–26"},{"as_of":"2026-06-01","doc_date":"2026-06-20","doc_date_source":"front_matter:updated","expires":null,"fresh":true,"kind":"markdown","owner":"Billing","passages":2,"path":"billing/rates-2026-27.md","reasons":[],"status":"active","title":"Residential Water Rates 2026–27"},{"as_of":"2026-02-20","doc_date":"2026-02-20","doc_date_source":"front_matter:updated","expires":null,"fresh":true,"kind":"markdown","owner":"Billing","passages":2,"path":"billing/rates-service-fees.md","reasons":[],"status":"active","title":"Service Fees and Reconnection Charges"}],"title":"Fernhollow billing pages","tokenizer":{"language":"english","stopwords":"english"}}');
INSERT INTO "runs" VALUES(2,'2026-12-03T14:38:15Z','2026-12-03T14:38:15Z','done','2026-12-01',365,'3de54b8995262046','6250c399c31680ac','{"source":"default","support":0.45,"weak_margin":0.05}','{"documents":5,"failed":0,"freshness":0.6,"mean_age_days":160.8,"passages":10}','{"covered":4,"fallback_exposure":0.07520891364902507,"gap":2,"questions":8,"stale":2,"stale_exposure":0.09192200557103064,"weight":359.0}','{"checks":[{"figure":"gap_share","limit":"max_gap_share","max":0.5,"passed":true,"value":0.25},{"figure":"fallback_exposure","limit":"max_fallback_exposure","max":0.5,"passed":true,"value":0.07520891364902507}],"message":"gate passed: gap_share 0.25 <= max 0.50, fallback_exposure 0.08 <= max 0.50","passed":true}','[]','{"briefs":[{"examples":["As a landlord, can I keep the water account in my name between tenants?","Do landlords receive a notice when a tenant closes their account?"],"owner":"Billing","questions":["q14","q15"],"terms":["landlord","tenant"],"title":"landlord, tenant (landlord)","topic":"landlord","weight":27.0}],"documents":[{"as_of":null,"doc_date":"2025-07-10","doc_date_source":"og:article:modified_time","expires":null,"fresh":null,"kind":"html","owner":"Billing","passages":0,"path":"billing/landlord-accounts.html","reasons":[],"status":"removed","title":"Accounts for Landlords and Property Managers | Fernhollow Water Cooperative"},{"as_of":"2026-05-19","doc_date":"2026-05-19","doc_date_source":"front_matter:updated","expires":null,"fresh":true,"kind":"markdown","owner":"Billing","passages":2,"path":"billing/payment-arrangements.md","reasons":[],"status":"active","title":"Payment Plans for Past-Due Balances"},{"as_of":"2026-09-08","doc_date":"2026-09-08","doc_date_source":"jsonld:dateModified","expires":null,"fresh":true,"kind":"html","owner":"Billing","passages":2,"path":"billing/payment-options.html","reasons":[],"status":"active","title":"Ways to Pay Your Bill | Fernhollow Water Cooperative"},{"as_of":"2025-06-18","doc_date":"2025-06-18","doc_date_source":"front_matter:updated","expires":null,"fresh":false,"kind":"markdown","owner":"Billing","passages":2,"path":"billing/rates-2025-26.md","reasons":["too_old"],"status":"active","title":"Residential Water Rates 2025–26"},{"as_of":"2026-06-20","doc_date":"2026-06-20","doc_date_source":"front_matter:updated","expires":null,"fresh":true,"kind":"markdown","owner":"Billing","passages":2,"path":"billing/rates-2026-27.md","reasons":[],"status":"active","title":"Residential Water Rates 2026–27"},{"as_of":"2026-02-20","doc_date":"2026-02-20","doc_date_source":"front_matter:updated","expires":null,"fresh":false,"kind":"markdown","owner":"Billing","passages":2,"path":"billing/rates-service-fees.md","reasons":["too_old"],"status":"active","title":"Service Fees and Reconnection Charges"}],"title":"Fernhollow billing pages","tokenizer":{"language":"english","stopwords":"english"}}');
CREATE TABLE statements (
    id          INTEGER PRIMARY KEY,
    passage_id  INTEGER NOT NULL REFERENCES passages(id) ON DELETE CASCADE,
    expression  TEXT NOT NULL,
    sentence    TEXT NOT NULL,
    start       TEXT NOT NULL,
    end         TEXT NOT NULL,
    granularity TEXT NOT NULL,
    role        TEXT NOT NULL,
    char_start  INTEGER NOT NULL,
    char_end    INTEGER NOT NULL
, timex_type TEXT NOT NULL DEFAULT 'DATE', timex_value TEXT);
INSERT INTO "statements" VALUES(1,3,'2025–26','Residential Water Rates 2025–26','2025-07-01','2026-06-30','year','period',24,31,'DATE',NULL);
INSERT INTO "statements" VALUES(2,3,'July 1, 2025','These rates are effective July 1, 2025, as approved by the Fernhollow Water Cooperative board of directors for single-family and duplex residential accounts.','2025-07-01','2025-07-01','day','effective',59,71,'DATE',NULL);
INSERT INTO "statements" VALUES(3,5,'2026–27','Residential Water Rates 2026–27','2026-07-01','2027-06-30','year','period',24,31,'DATE',NULL);
INSERT INTO "statements" VALUES(4,5,'July 1, 2026','These rates are effective July 1, 2026, as approved by the Fernhollow Water Cooperative board of directors.','2026-07-01','2026-07-01','day','effective',59,71,'DATE',NULL);
INSERT INTO "statements" VALUES(5,9,'March 1, 2026','This fee schedule is effective March 1, 2026.','2026-03-01','2026-03-01','day','effective',70,83,'DATE',NULL);
CREATE TABLE terms (
    id   INTEGER PRIMARY KEY,
    term TEXT NOT NULL UNIQUE
);
INSERT INTO "terms" VALUES(1,'account');
INSERT INTO "terms" VALUES(2,'agreement');
INSERT INTO "terms" VALUES(3,'ani');
INSERT INTO "terms" VALUES(4,'arrang');
INSERT INTO "terms" VALUES(5,'automat');
INSERT INTO "terms" VALUES(6,'base');
INSERT INTO "terms" VALUES(7,'between');
INSERT INTO "terms" VALUES(8,'bill');
INSERT INTO "terms" VALUES(9,'build');
INSERT INTO "terms" VALUES(10,'charg');
INSERT INTO "terms" VALUES(11,'choos');
INSERT INTO "terms" VALUES(12,'close');
INSERT INTO "terms" VALUES(13,'continu');
INSERT INTO "terms" VALUES(14,'cost');
INSERT INTO "terms" VALUES(15,'dure');
INSERT INTO "terms" VALUES(16,'each');
INSERT INTO "terms" VALUES(17,'enrol');
INSERT INTO "terms" VALUES(18,'form');
INSERT INTO "terms" VALUES(19,'keep');
INSERT INTO "terms" VALUES(20,'landlord');
INSERT INTO "terms" VALUES(21,'leas');
INSERT INTO "terms" VALUES(22,'mail');
INSERT INTO "terms" VALUES(23,'make');
INSERT INTO "terms" VALUES(24,'manag');
INSERT INTO "terms" VALUES(25,'may');
INSERT INTO "terms" VALUES(26,'meter');
INSERT INTO "terms" VALUES(27,'move');
INSERT INTO "terms" VALUES(28,'must');
INSERT INTO "terms" VALUES(29,'name');
INSERT INTO "terms" VALUES(30,'never');
INSERT INTO "terms" VALUES(31,'notic');
INSERT INTO "terms" VALUES(32,'off');
INSERT INTO "terms" VALUES(33,'one');
INSERT INTO "terms" VALUES(34,'onli');
INSERT INTO "terms" VALUES(35,'open');
INSERT INTO "terms" VALUES(36,'own');
INSERT INTO "terms" VALUES(37,'owner');
INSERT INTO "terms" VALUES(38,'pass');
INSERT INTO "terms" VALUES(39,'pay');
INSERT INTO "terms" VALUES(40,'properti');
INSERT INTO "terms" VALUES(41,'receiv');
INSERT INTO "terms" VALUES(42,'rental');
INSERT INTO "terms" VALUES(43,'servic');
INSERT INTO "terms" VALUES(44,'share');
INSERT INTO "terms" VALUES(45,'shut');
INSERT INTO "terms" VALUES(46,'stay');
INSERT INTO "terms" VALUES(47,'sure');
INSERT INTO "terms" VALUES(48,'tell');
INSERT INTO "terms" VALUES(49,'tenant');
INSERT INTO "terms" VALUES(50,'through');
INSERT INTO "terms" VALUES(51,'time');
INSERT INTO "terms" VALUES(52,'us');
INSERT INTO "terms" VALUES(53,'usag');
INSERT INTO "terms" VALUES(54,'vacanc');
INSERT INTO "terms" VALUES(55,'vacant');
INSERT INTO "terms" VALUES(56,'want');
INSERT INTO "terms" VALUES(57,'water');
INSERT INTO "terms" VALUES(58,'whose');
INSERT INTO "terms" VALUES(59,'address');
INSERT INTO "terms" VALUES(60,'author');
INSERT INTO "terms" VALUES(61,'balanc');
INSERT INTO "terms" VALUES(62,'becaus');
INSERT INTO "terms" VALUES(63,'becom');
INSERT INTO "terms" VALUES(64,'cannot');
INSERT INTO "terms" VALUES(65,'copi');
INSERT INTO "terms" VALUES(66,'detail');
INSERT INTO "terms" VALUES(67,'duplic');
INSERT INTO "terms" VALUES(68,'follow');
INSERT INTO "terms" VALUES(69,'inform');
INSERT INTO "terms" VALUES(70,'lien');
INSERT INTO "terms" VALUES(71,'next');
INSERT INTO "terms" VALUES(72,'send');
INSERT INTO "terms" VALUES(73,'unpaid');
INSERT INTO "terms" VALUES(74,'without');
INSERT INTO "terms" VALUES(75,'19');
INSERT INTO "terms" VALUES(76,'20');
INSERT INTO "terms" VALUES(77,'2025');
INSERT INTO "terms" VALUES(78,'25');
INSERT INTO "terms" VALUES(79,'26');
INSERT INTO "terms" VALUES(80,'35');
INSERT INTO "terms" VALUES(81,'85');
INSERT INTO "terms" VALUES(82,'90');
INSERT INTO "terms" VALUES(83,'approv');
INSERT INTO "terms" VALUES(84,'board');
INSERT INTO "terms" VALUES(85,'cooper');
INSERT INTO "terms" VALUES(86,'director');
INSERT INTO "terms" VALUES(87,'distribut');
INSERT INTO "terms" VALUES(88,'duplex');
INSERT INTO "terms" VALUES(89,'effect');
INSERT INTO "terms" VALUES(90,'famili');
INSERT INTO "terms" VALUES(91,'fernhollow');
INSERT INTO "terms" VALUES(92,'inch');
INSERT INTO "terms" VALUES(93,'juli');
INSERT INTO "terms" VALUES(94,'mainten');
INSERT INTO "terms" VALUES(95,'month');
INSERT INTO "terms" VALUES(96,'pipe');
INSERT INTO "terms" VALUES(97,'rate');
INSERT INTO "terms" VALUES(98,'read');
INSERT INTO "terms" VALUES(99,'residenti');
INSERT INTO "terms" VALUES(100,'singl');
INSERT INTO "terms" VALUES(101,'size');
INSERT INTO "terms" VALUES(102,'usual');
INSERT INTO "terms" VALUES(103,'000');
INSERT INTO "terms" VALUES(104,'001');
INSERT INTO "terms" VALUES(105,'12');
INSERT INTO "terms" VALUES(106,'40');
INSERT INTO "terms" VALUES(107,'45');
INSERT INTO "terms" VALUES(108,'abov');
INSERT INTO "terms" VALUES(109,'first');
INSERT INTO "terms" VALUES(110,'gallon');
INSERT INTO "terms" VALUES(111,'household');
INSERT INTO "terms" VALUES(112,'insid');
INSERT INTO "terms" VALUES(113,'per');
INSERT INTO "terms" VALUES(114,'period');
INSERT INTO "terms" VALUES(115,'price');
INSERT INTO "terms" VALUES(116,'record');
INSERT INTO "terms" VALUES(117,'remain');
INSERT INTO "terms" VALUES(118,'three');
INSERT INTO "terms" VALUES(119,'tier');
INSERT INTO "terms" VALUES(120,'use');
INSERT INTO "terms" VALUES(121,'work');
INSERT INTO "terms" VALUES(122,'10');
INSERT INTO "terms" VALUES(123,'2026');
INSERT INTO "terms" VALUES(124,'21');
INSERT INTO "terms" VALUES(125,'27');
INSERT INTO "terms" VALUES(126,'38');
INSERT INTO "terms" VALUES(127,'60');
INSERT INTO "terms" VALUES(128,'appli');
INSERT INTO "terms" VALUES(129,'area');
INSERT INTO "terms" VALUES(130,'bring');
INSERT INTO "terms" VALUES(131,'cover');
INSERT INTO "terms" VALUES(132,'depend');
INSERT INTO "terms" VALUES(133,'everi');
INSERT INTO "terms" VALUES(134,'home');
INSERT INTO "terms" VALUES(135,'most');
INSERT INTO "terms" VALUES(136,'number');
INSERT INTO "terms" VALUES(137,'print');
INSERT INTO "terms" VALUES(138,'street');
INSERT INTO "terms" VALUES(139,'upkeep');
INSERT INTO "terms" VALUES(140,'whether');
INSERT INTO "terms" VALUES(141,'0100');
INSERT INTO "terms" VALUES(142,'15');
INSERT INTO "terms" VALUES(143,'555');
INSERT INTO "terms" VALUES(144,'80');
INSERT INTO "terms" VALUES(145,'95');
INSERT INTO "terms" VALUES(146,'about');
INSERT INTO "terms" VALUES(147,'afford');
INSERT INTO "terms" VALUES(148,'calcul');
INSERT INTO "terms" VALUES(149,'call');
INSERT INTO "terms" VALUES(150,'care');
INSERT INTO "terms" VALUES(151,'custom');
INSERT INTO "terms" VALUES(152,'essenti');
INSERT INTO "terms" VALUES(153,'exampl');
INSERT INTO "terms" VALUES(154,'explain');
INSERT INTO "terms" VALUES(155,'indoor');
INSERT INTO "terms" VALUES(156,'question');
INSERT INTO "terms" VALUES(157,'rise');
INSERT INTO "terms" VALUES(158,'top');
INSERT INTO "terms" VALUES(159,'write');
INSERT INTO "terms" VALUES(160,'action');
INSERT INTO "terms" VALUES(161,'add');
INSERT INTO "terms" VALUES(162,'adjust');
INSERT INTO "terms" VALUES(163,'agre');
INSERT INTO "terms" VALUES(164,'anyth');
INSERT INTO "terms" VALUES(165,'befor');
INSERT INTO "terms" VALUES(166,'behind');
INSERT INTO "terms" VALUES(167,'catch');
INSERT INTO "terms" VALUES(168,'collect');
INSERT INTO "terms" VALUES(169,'date');
INSERT INTO "terms" VALUES(170,'due');
INSERT INTO "terms" VALUES(171,'fallen');
INSERT INTO "terms" VALUES(172,'fee');
INSERT INTO "terms" VALUES(173,'front');
INSERT INTO "terms" VALUES(174,'includ');
INSERT INTO "terms" VALUES(175,'instal');
INSERT INTO "terms" VALUES(176,'late');
INSERT INTO "terms" VALUES(177,'long');
INSERT INTO "terms" VALUES(178,'lose');
INSERT INTO "terms" VALUES(179,'miss');
INSERT INTO "terms" VALUES(180,'need');
INSERT INTO "terms" VALUES(181,'offic');
INSERT INTO "terms" VALUES(182,'onc');
INSERT INTO "terms" VALUES(183,'over');
INSERT INTO "terms" VALUES(184,'paid');
INSERT INTO "terms" VALUES(185,'past');
INSERT INTO "terms" VALUES(186,'payment');
INSERT INTO "terms" VALUES(187,'plan');
INSERT INTO "terms" VALUES(188,'regular');
INSERT INTO "terms" VALUES(189,'set');
INSERT INTO "terms" VALUES(190,'sever');
INSERT INTO "terms" VALUES(191,'spread');
INSERT INTO "terms" VALUES(192,'taken');
INSERT INTO "terms" VALUES(193,'tri');
INSERT INTO "terms" VALUES(194,'twelv');
INSERT INTO "terms" VALUES(195,'up');
INSERT INTO "terms" VALUES(196,'visit');
INSERT INTO "terms" VALUES(197,'also');
INSERT INTO "terms" VALUES(198,'combin');
INSERT INTO "terms" VALUES(199,'hand');
INSERT INTO "terms" VALUES(200,'help');
INSERT INTO "terms" VALUES(201,'incom');
INSERT INTO "terms" VALUES(202,'itself');
INSERT INTO "terms" VALUES(203,'low');
INSERT INTO "terms" VALUES(204,'lower');
INSERT INTO "terms" VALUES(205,'more');
INSERT INTO "terms" VALUES(206,'program');
INSERT INTO "terms" VALUES(207,'qualifi');
INSERT INTO "terms" VALUES(208,'00');
INSERT INTO "terms" VALUES(209,'120');
INSERT INTO "terms" VALUES(210,'250');
INSERT INTO "terms" VALUES(211,'30');
INSERT INTO "terms" VALUES(212,'after');
INSERT INTO "terms" VALUES(213,'bank');
INSERT INTO "terms" VALUES(214,'been');
INSERT INTO "terms" VALUES(215,'bounc');
INSERT INTO "terms" VALUES(216,'brought');
INSERT INTO "terms" VALUES(217,'busi');
INSERT INTO "terms" VALUES(218,'caus');
INSERT INTO "terms" VALUES(219,'check');
INSERT INTO "terms" VALUES(220,'current');
INSERT INTO "terms" VALUES(221,'day');
INSERT INTO "terms" VALUES(222,'declin');
INSERT INTO "terms" VALUES(223,'draft');
INSERT INTO "terms" VALUES(224,'found');
INSERT INTO "terms" VALUES(225,'happen');
INSERT INTO "terms" VALUES(226,'hour');
INSERT INTO "terms" VALUES(227,'lock');
INSERT INTO "terms" VALUES(228,'march');
INSERT INTO "terms" VALUES(229,'non');
INSERT INTO "terms" VALUES(230,'normal');
INSERT INTO "terms" VALUES(231,'older');
INSERT INTO "terms" VALUES(232,'other');
INSERT INTO "terms" VALUES(233,'place');
INSERT INTO "terms" VALUES(234,'plus');
INSERT INTO "terms" VALUES(235,'reconnect');
INSERT INTO "terms" VALUES(236,'refund');
INSERT INTO "terms" VALUES(237,'regist');
INSERT INTO "terms" VALUES(238,'repair');
INSERT INTO "terms" VALUES(239,'request');
INSERT INTO "terms" VALUES(240,'restor');
INSERT INTO "terms" VALUES(241,'return');
INSERT INTO "terms" VALUES(242,'same');
INSERT INTO "terms" VALUES(243,'schedul');
INSERT INTO "terms" VALUES(244,'shutoff');
INSERT INTO "terms" VALUES(245,'tamper');
INSERT INTO "terms" VALUES(246,'test');
INSERT INTO "terms" VALUES(247,'than');
INSERT INTO "terms" VALUES(248,'think');
INSERT INTO "terms" VALUES(249,'two');
INSERT INTO "terms" VALUES(250,'weekend');
INSERT INTO "terms" VALUES(251,'within');
INSERT INTO "terms" VALUES(252,'wrong');
INSERT INTO "terms" VALUES(253,'year');
INSERT INTO "terms" VALUES(254,'all');
INSERT INTO "terms" VALUES(255,'goe');
INSERT INTO "terms" VALUES(256,'member');
INSERT INTO "terms" VALUES(257,'money');
INSERT INTO "terms" VALUES(258,'paperwork');
INSERT INTO "terms" VALUES(259,'rather');
INSERT INTO "terms" VALUES(260,'recov');
INSERT INTO "terms" VALUES(261,'roll');
INSERT INTO "terms" VALUES(262,'technician');
INSERT INTO "terms" VALUES(263,'truck');
INSERT INTO "terms" VALUES(264,'0142');
INSERT INTO "terms" VALUES(265,'24');
INSERT INTO "terms" VALUES(266,'autom');
INSERT INTO "terms" VALUES(267,'avail');
INSERT INTO "terms" VALUES(268,'card');
INSERT INTO "terms" VALUES(269,'credit');
INSERT INTO "terms" VALUES(270,'debit');
INSERT INTO "terms" VALUES(271,'free');
INSERT INTO "terms" VALUES(272,'line');
INSERT INTO "terms" VALUES(273,'onlin');
INSERT INTO "terms" VALUES(274,'person');
INSERT INTO "terms" VALUES(275,'phone');
INSERT INTO "terms" VALUES(276,'portal');
INSERT INTO "terms" VALUES(277,'post');
INSERT INTO "terms" VALUES(278,'prompt');
INSERT INTO "terms" VALUES(279,'readi');
INSERT INTO "terms" VALUES(280,'transfer');
INSERT INTO "terms" VALUES(281,'way');
INSERT INTO "terms" VALUES(282,'whichev');
INSERT INTO "terms" VALUES(283,'2210');
INSERT INTO "terms" VALUES(284,'410');
INSERT INTO "terms" VALUES(285,'allow');
INSERT INTO "terms" VALUES(286,'arriv');
INSERT INTO "terms" VALUES(287,'barcod');
INSERT INTO "terms" VALUES(288,'besid');
INSERT INTO "terms" VALUES(289,'box');
INSERT INTO "terms" VALUES(290,'cash');
INSERT INTO "terms" VALUES(291,'cashier');
INSERT INTO "terms" VALUES(292,'desk');
INSERT INTO "terms" VALUES(293,'door');
INSERT INTO "terms" VALUES(294,'drop');
INSERT INTO "terms" VALUES(295,'five');
INSERT INTO "terms" VALUES(296,'friday');
INSERT INTO "terms" VALUES(297,'market');
INSERT INTO "terms" VALUES(298,'millrac');
INSERT INTO "terms" VALUES(299,'monday');
INSERT INTO "terms" VALUES(300,'northgat');
INSERT INTO "terms" VALUES(301,'order');
INSERT INTO "terms" VALUES(302,'payabl');
INSERT INTO "terms" VALUES(303,'po');
INSERT INTO "terms" VALUES(304,'road');
INSERT INTO "terms" VALUES(305,'scan');
INSERT INTO "terms" VALUES(306,'seven');
INSERT INTO "terms" VALUES(307,'stub');
INSERT INTO "terms" VALUES(308,'take');
CREATE INDEX passages_document ON passages(document_id);
CREATE INDEX statements_passage ON statements(passage_id);
CREATE INDEX results_qid ON results(run_id, qid);
COMMIT;
