/**
 * Name parts for fictional demo patients. Given and family names are drawn independently, so a
 * patient's full name is a random pairing, not a person.
 */

export const FEMALE_GIVEN_NAMES: readonly string[] = [
  'Aoife', 'Amara', 'Beatriz', 'Chloé', 'Dagny', 'Esi', 'Fatima', 'Grainne', 'Hyun-joo', 'Ines',
  'Jolanta', 'Kalani', 'Leila', 'Maeve', 'Nkechi', 'Olwen', 'Paulina', 'Quynh', 'Rosalind', 'Sadhbh',
  'Tamsin', 'Ulla', 'Valentina', 'Wanjiru', 'Ximena', 'Yara', 'Zofia', 'Anneliese', 'Bronagh', 'Meera',
];

export const MALE_GIVEN_NAMES: readonly string[] = [
  'Aarav', 'Bartholomew', 'Cathal', 'Dmitri', 'Emeka', 'Fionn', 'Goran', 'Hamza', 'Ivo', 'Joaquin',
  'Kofi', 'Lorcan', 'Matthias', 'Niall', 'Oisin', 'Pavel', 'Quentin', 'Rashid', 'Seamus', 'Tadhg',
  'Umar', 'Vikram', 'Wilhelm', 'Xavier', 'Yusuf', 'Zoltan', 'Alasdair', 'Bogdan', 'Conall', 'Tomasz',
];

export const FAMILY_NAMES: readonly string[] = [
  'Achterberg', 'Ballantyne', 'Carrowmore', 'Dunleavy', 'Eskildsen', 'Fairweather', 'Gallagher-Nunes', 'Halloran',
  'Ibekwe', 'Jankowska', 'Kavanagh', 'Larkspur', 'MacAlister', 'Nakashima', 'Ó Faoláin', 'Pemberton',
  'Quillfeather', 'Rathbone', 'Sandoval', 'Thornbury', 'Uchenna', 'Valdivia', 'Whelan-Okoro', 'Yilmaz',
  'Zielinski', 'Abernathy', 'Breslin', 'Chaudhry', 'Delacroix', 'Eberhardt', 'Flanagan', 'Grünewald',
  'Hartigan', 'Iwasaki', 'Kinsella', 'Lindgren', 'Mbeki-Shaw', 'Novak', 'Okafor-Byrne', 'Petrakis',
];
